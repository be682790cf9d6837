CREATE TYPE "public"."version_kind" AS ENUM('save', 'autosave', 'restore', 'alt', 'merge', 'copy');--> statement-breakpoint
CREATE TABLE "drafts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"name" text NOT NULL,
	"is_main" boolean DEFAULT false NOT NULL,
	"head_version_id" uuid,
	"created_by" uuid,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "side_saves" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"draft_id" uuid NOT NULL,
	"base_version_id" uuid,
	"head_version_id" uuid,
	"author_id" uuid NOT NULL,
	"note" text,
	"doc" jsonb NOT NULL,
	"lines" jsonb NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolved_version_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"draft_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"parent_id" uuid,
	"author_id" uuid,
	"kind" "version_kind" DEFAULT 'save' NOT NULL,
	"note" text,
	"doc" jsonb NOT NULL,
	"lines" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "drafts" ADD CONSTRAINT "drafts_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "drafts" ADD CONSTRAINT "drafts_head_version_id_versions_id_fk" FOREIGN KEY ("head_version_id") REFERENCES "public"."versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "drafts" ADD CONSTRAINT "drafts_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "side_saves" ADD CONSTRAINT "side_saves_draft_id_drafts_id_fk" FOREIGN KEY ("draft_id") REFERENCES "public"."drafts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "side_saves" ADD CONSTRAINT "side_saves_base_version_id_versions_id_fk" FOREIGN KEY ("base_version_id") REFERENCES "public"."versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "side_saves" ADD CONSTRAINT "side_saves_head_version_id_versions_id_fk" FOREIGN KEY ("head_version_id") REFERENCES "public"."versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "side_saves" ADD CONSTRAINT "side_saves_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "side_saves" ADD CONSTRAINT "side_saves_resolved_version_id_versions_id_fk" FOREIGN KEY ("resolved_version_id") REFERENCES "public"."versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "versions" ADD CONSTRAINT "versions_draft_id_drafts_id_fk" FOREIGN KEY ("draft_id") REFERENCES "public"."drafts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "versions" ADD CONSTRAINT "versions_parent_id_versions_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "versions" ADD CONSTRAINT "versions_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "drafts_song_idx" ON "drafts" USING btree ("song_id");--> statement-breakpoint
CREATE UNIQUE INDEX "drafts_one_main_per_song" ON "drafts" USING btree ("song_id") WHERE "drafts"."is_main";--> statement-breakpoint
CREATE INDEX "side_saves_draft_open_idx" ON "side_saves" USING btree ("draft_id") WHERE "side_saves"."resolved_at" IS NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "versions_draft_number_key" ON "versions" USING btree ("draft_id","number");--> statement-breakpoint
CREATE INDEX "versions_draft_created_idx" ON "versions" USING btree ("draft_id","created_at");