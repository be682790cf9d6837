CREATE TYPE "public"."alt_status" AS ENUM('open', 'taken', 'passed');--> statement-breakpoint
CREATE TYPE "public"."notification_kind" AS ENUM('alt.proposed', 'alt.taken', 'alt.passed');--> statement-breakpoint
CREATE TABLE "alt_comments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"alt_id" uuid NOT NULL,
	"author_id" uuid,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "alt_votes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"alt_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"value" smallint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "alt_votes_value_check" CHECK ("alt_votes"."value" IN (-1, 1))
);
--> statement-breakpoint
CREATE TABLE "alts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"draft_id" uuid NOT NULL,
	"line_id" text NOT NULL,
	"line_text" text NOT NULL,
	"base_version_id" uuid,
	"text" text NOT NULL,
	"author_id" uuid,
	"status" "alt_status" DEFAULT 'open' NOT NULL,
	"decided_by" uuid,
	"decided_at" timestamp with time zone,
	"taken_version_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "presence" (
	"connection_id" uuid PRIMARY KEY NOT NULL,
	"song_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"instance_id" text NOT NULL,
	"connected_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_seen_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "notifications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"kind" "notification_kind" NOT NULL,
	"song_id" uuid NOT NULL,
	"draft_id" uuid,
	"alt_id" uuid,
	"actor_id" uuid,
	"title" text NOT NULL,
	"body" text NOT NULL,
	"url" text NOT NULL,
	"email" boolean DEFAULT false NOT NULL,
	"mailed_at" timestamp with time zone,
	"read_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "alt_comments" ADD CONSTRAINT "alt_comments_alt_id_alts_id_fk" FOREIGN KEY ("alt_id") REFERENCES "public"."alts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alt_comments" ADD CONSTRAINT "alt_comments_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alt_votes" ADD CONSTRAINT "alt_votes_alt_id_alts_id_fk" FOREIGN KEY ("alt_id") REFERENCES "public"."alts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alt_votes" ADD CONSTRAINT "alt_votes_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alts" ADD CONSTRAINT "alts_draft_id_drafts_id_fk" FOREIGN KEY ("draft_id") REFERENCES "public"."drafts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alts" ADD CONSTRAINT "alts_base_version_id_versions_id_fk" FOREIGN KEY ("base_version_id") REFERENCES "public"."versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alts" ADD CONSTRAINT "alts_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alts" ADD CONSTRAINT "alts_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alts" ADD CONSTRAINT "alts_taken_version_id_versions_id_fk" FOREIGN KEY ("taken_version_id") REFERENCES "public"."versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "presence" ADD CONSTRAINT "presence_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "presence" ADD CONSTRAINT "presence_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_draft_id_drafts_id_fk" FOREIGN KEY ("draft_id") REFERENCES "public"."drafts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_alt_id_alts_id_fk" FOREIGN KEY ("alt_id") REFERENCES "public"."alts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "alt_comments_alt_idx" ON "alt_comments" USING btree ("alt_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "alt_votes_alt_user_key" ON "alt_votes" USING btree ("alt_id","user_id");--> statement-breakpoint
CREATE INDEX "alts_draft_line_idx" ON "alts" USING btree ("draft_id","line_id");--> statement-breakpoint
CREATE INDEX "alts_draft_status_idx" ON "alts" USING btree ("draft_id","status");--> statement-breakpoint
CREATE INDEX "presence_song_seen_idx" ON "presence" USING btree ("song_id","last_seen_at");--> statement-breakpoint
CREATE INDEX "notifications_user_created_idx" ON "notifications" USING btree ("user_id","created_at");--> statement-breakpoint
CREATE INDEX "notifications_mail_due_idx" ON "notifications" USING btree ("user_id","created_at") WHERE "notifications"."email" AND "notifications"."mailed_at" IS NULL;