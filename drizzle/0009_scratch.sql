CREATE TYPE "public"."scratch_format" AS ENUM('wav', 'mp3', 'flac', 'ogg', 'webm', 'opus');--> statement-breakpoint
CREATE TABLE "scratch_takes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"song_id" uuid NOT NULL,
	"author_id" uuid,
	"bar" integer NOT NULL,
	"name" text NOT NULL,
	"duration_ms" integer NOT NULL,
	"format" "scratch_format" NOT NULL,
	"size_bytes" bigint NOT NULL,
	"storage_key" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scratch_takes_bar_valid" CHECK ("scratch_takes"."bar" >= 1),
	CONSTRAINT "scratch_takes_duration_valid" CHECK ("scratch_takes"."duration_ms" > 0)
);
--> statement-breakpoint
ALTER TABLE "scratch_takes" ADD CONSTRAINT "scratch_takes_song_id_songs_id_fk" FOREIGN KEY ("song_id") REFERENCES "public"."songs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scratch_takes" ADD CONSTRAINT "scratch_takes_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "scratch_takes_song_bar_idx" ON "scratch_takes" USING btree ("song_id","bar");