-- Sections of one song never share a bar. The handlers check first (with a message naming
-- the section in the way); this makes the database refuse it even so. Deferrable, so a
-- reorder can move several sections within one transaction.
CREATE EXTENSION IF NOT EXISTS btree_gist;--> statement-breakpoint
ALTER TABLE "sections" ADD CONSTRAINT "sections_no_overlap"
  EXCLUDE USING gist ("song_id" WITH =, int4range("start_bar", "end_bar", '[]') WITH &&)
  DEFERRABLE INITIALLY IMMEDIATE;
