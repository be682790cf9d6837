CREATE TYPE "public"."signoff_decision" AS ENUM('approve', 'decline');--> statement-breakpoint
CREATE TYPE "public"."signoff_status" AS ENUM('open', 'sealed', 'cancelled', 'declined', 'withdrawn');--> statement-breakpoint
CREATE TABLE "seal_lifts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"seal_id" uuid NOT NULL,
	"lifted_by" uuid,
	"lifted_by_name" text NOT NULL,
	"reason" text NOT NULL,
	"new_draft_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "seal_lifts_reason_given" CHECK (length(btrim("seal_lifts"."reason")) >= 5)
);
--> statement-breakpoint
CREATE TABLE "seals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"version_id" uuid NOT NULL,
	"request_id" uuid,
	"sealed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"signers" jsonb NOT NULL,
	"split" jsonb NOT NULL,
	"pdf_key" text
);
--> statement-breakpoint
CREATE TABLE "signoff_requests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"draft_id" uuid NOT NULL,
	"version_id" uuid NOT NULL,
	"requested_by" uuid,
	"note" text,
	"status" "signoff_status" DEFAULT 'open' NOT NULL,
	"closed_reason" text,
	"closed_at" timestamp with time zone,
	"closed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "signoff_signers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"request_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"decision" "signoff_decision",
	"comment" text,
	"decided_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "split_lines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"user_id" uuid,
	"name" text NOT NULL,
	"role" text,
	"position" integer NOT NULL,
	"share_bp" integer NOT NULL,
	"confirmed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "split_lines_share_range" CHECK ("split_lines"."share_bp" > 0 AND "split_lines"."share_bp" <= 10000)
);
--> statement-breakpoint
ALTER TABLE "seal_lifts" ADD CONSTRAINT "seal_lifts_seal_id_seals_id_fk" FOREIGN KEY ("seal_id") REFERENCES "public"."seals"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seal_lifts" ADD CONSTRAINT "seal_lifts_lifted_by_users_id_fk" FOREIGN KEY ("lifted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seal_lifts" ADD CONSTRAINT "seal_lifts_new_draft_id_drafts_id_fk" FOREIGN KEY ("new_draft_id") REFERENCES "public"."drafts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seals" ADD CONSTRAINT "seals_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seals" ADD CONSTRAINT "seals_version_id_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seals" ADD CONSTRAINT "seals_request_id_signoff_requests_id_fk" FOREIGN KEY ("request_id") REFERENCES "public"."signoff_requests"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_requests" ADD CONSTRAINT "signoff_requests_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_requests" ADD CONSTRAINT "signoff_requests_draft_id_drafts_id_fk" FOREIGN KEY ("draft_id") REFERENCES "public"."drafts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_requests" ADD CONSTRAINT "signoff_requests_version_id_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_requests" ADD CONSTRAINT "signoff_requests_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_requests" ADD CONSTRAINT "signoff_requests_closed_by_users_id_fk" FOREIGN KEY ("closed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_signers" ADD CONSTRAINT "signoff_signers_request_id_signoff_requests_id_fk" FOREIGN KEY ("request_id") REFERENCES "public"."signoff_requests"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoff_signers" ADD CONSTRAINT "signoff_signers_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "split_lines" ADD CONSTRAINT "split_lines_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "split_lines" ADD CONSTRAINT "split_lines_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "seal_lifts_seal_key" ON "seal_lifts" USING btree ("seal_id");--> statement-breakpoint
CREATE INDEX "seals_song_idx" ON "seals" USING btree ("song_id");--> statement-breakpoint
CREATE INDEX "seals_version_idx" ON "seals" USING btree ("version_id");--> statement-breakpoint
CREATE UNIQUE INDEX "signoff_requests_one_open_per_draft" ON "signoff_requests" USING btree ("draft_id") WHERE "signoff_requests"."status" = 'open';--> statement-breakpoint
CREATE INDEX "signoff_requests_song_idx" ON "signoff_requests" USING btree ("song_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "signoff_signers_request_user_key" ON "signoff_signers" USING btree ("request_id","user_id");--> statement-breakpoint
CREATE INDEX "signoff_signers_user_idx" ON "signoff_signers" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "split_lines_song_idx" ON "split_lines" USING btree ("song_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "split_lines_song_user_key" ON "split_lines" USING btree ("song_id","user_id") WHERE "split_lines"."user_id" IS NOT NULL;