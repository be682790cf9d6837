CREATE TYPE "public"."beat_format" AS ENUM('wav', 'mp3', 'flac', 'ogg');--> statement-breakpoint
CREATE TYPE "public"."beat_status" AS ENUM('queued', 'analysing', 'ready', 'failed');--> statement-breakpoint
CREATE TYPE "public"."section_kind" AS ENUM('intro', 'verse', 'hook', 'pre-hook', 'bridge', 'break', 'outro', 'other');--> statement-breakpoint
CREATE TABLE "beats" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"bounce" integer NOT NULL,
	"uploaded_by" uuid,
	"original_name" text NOT NULL,
	"format" "beat_format" NOT NULL,
	"size_bytes" bigint NOT NULL,
	"storage_key" text NOT NULL,
	"status" "beat_status" DEFAULT 'queued' NOT NULL,
	"progress" integer DEFAULT 0 NOT NULL,
	"failure_reason" text,
	"job_id" text,
	"duration_ms" numeric(12, 3),
	"sample_rate" integer,
	"channels" integer,
	"bpm" numeric(7, 3),
	"bpm_confidence" real,
	"bpm_alternatives" jsonb,
	"offset_ms" numeric(10, 3),
	"peaks_key" text,
	"analysed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "beats_progress_range" CHECK ("beats"."progress" BETWEEN 0 AND 100)
);
--> statement-breakpoint
CREATE TABLE "sections" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"kind" "section_kind" NOT NULL,
	"label" text DEFAULT '' NOT NULL,
	"start_bar" integer NOT NULL,
	"end_bar" integer NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sections_bars_valid" CHECK ("sections"."start_bar" >= 1 AND "sections"."end_bar" >= "sections"."start_bar")
);
--> statement-breakpoint
ALTER TABLE "beats" ADD CONSTRAINT "beats_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "beats" ADD CONSTRAINT "beats_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sections" ADD CONSTRAINT "sections_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sections" ADD CONSTRAINT "sections_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "beats_song_bounce_key" ON "beats" USING btree ("song_id","bounce");--> statement-breakpoint
CREATE INDEX "beats_status_idx" ON "beats" USING btree ("status");--> statement-breakpoint
CREATE INDEX "sections_song_idx" ON "sections" USING btree ("song_id","start_bar");