-- Sealed final sheets are kept by the database itself, whatever code runs against it:
--  * a version with a seal that was not lifted cannot be deleted, not even by a cascade from
--    its song or draft, and its draft takes no new versions;
--  * a seal row is never updated and never deleted directly; a cascade may remove it only
--    after the owner lifted it (the lift row is the record of unsealing);
--  * the split sheet kept in a seal totals exactly 10 000 basis points and every listed
--    member confirmed their line (a trigger with a plain message, and CHECKs behind it);
--  * a song's working split sheet totals 10 000 basis points whenever it has lines
--    (checked at commit, so a sheet can be replaced line by line in one transaction).

CREATE OR REPLACE FUNCTION barsmith_version_sealed(p_version uuid) RETURNS boolean
LANGUAGE sql STABLE AS $$
  SELECT EXISTS (
    SELECT 1 FROM seals s
    WHERE s.version_id = p_version
      AND NOT EXISTS (SELECT 1 FROM seal_lifts l WHERE l.seal_id = s.id))
$$;

CREATE OR REPLACE FUNCTION barsmith_split_total(p_split jsonb) RETURNS bigint
LANGUAGE sql IMMUTABLE AS $$
  SELECT coalesce(sum((e ->> 'shareBp')::bigint), 0)
  FROM jsonb_array_elements(CASE WHEN jsonb_typeof(p_split) = 'array' THEN p_split ELSE '[]'::jsonb END) e
$$;

CREATE OR REPLACE FUNCTION barsmith_split_unconfirmed(p_split jsonb) RETURNS bigint
LANGUAGE sql IMMUTABLE AS $$
  SELECT count(*)
  FROM jsonb_array_elements(CASE WHEN jsonb_typeof(p_split) = 'array' THEN p_split ELSE '[]'::jsonb END) e
  WHERE coalesce(e ->> 'userId', '') <> '' AND coalesce(e ->> 'confirmedAt', '') = ''
$$;

CREATE OR REPLACE FUNCTION barsmith_percent(p_bp bigint) RETURNS text
LANGUAGE sql IMMUTABLE AS $$
  SELECT to_char(p_bp / 100.0, 'FM9990.00')
$$;

ALTER TABLE seals DROP CONSTRAINT IF EXISTS seals_split_total_100;
ALTER TABLE seals ADD CONSTRAINT seals_split_total_100 CHECK (barsmith_split_total(split) = 10000);
ALTER TABLE seals DROP CONSTRAINT IF EXISTS seals_split_confirmed;
ALTER TABLE seals ADD CONSTRAINT seals_split_confirmed CHECK (barsmith_split_unconfirmed(split) = 0);

-- Versions: a sealed one is never deleted; its draft takes no new version while sealed.
CREATE OR REPLACE FUNCTION barsmith_versions_sealed_keep() RETURNS trigger AS $$
DECLARE
  v_title text;
BEGIN
  IF barsmith_version_sealed(OLD.id) THEN
    SELECT so.title INTO v_title FROM drafts d JOIN songs so ON so.id = d.song_id WHERE d.id = OLD.draft_id;
    RAISE EXCEPTION 'Version % of "%" is sealed as the final sheet: it, its draft and its song cannot be deleted. The owner must unseal it first.', OLD.number, coalesce(v_title, 'this song')
      USING ERRCODE = 'P0001';
  END IF;
  RETURN OLD;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS versions_sealed_keep ON versions;
CREATE TRIGGER versions_sealed_keep BEFORE DELETE ON versions
  FOR EACH ROW EXECUTE FUNCTION barsmith_versions_sealed_keep();

CREATE OR REPLACE FUNCTION barsmith_versions_sealed_draft() RETURNS trigger AS $$
DECLARE
  v_number integer;
BEGIN
  SELECT v.number INTO v_number FROM versions v
  WHERE v.draft_id = NEW.draft_id AND barsmith_version_sealed(v.id)
  LIMIT 1;
  IF FOUND THEN
    RAISE EXCEPTION 'This draft holds the sealed final sheet (version %) and takes no new versions. Start a new draft from it, or ask the owner to unseal it.', v_number
      USING ERRCODE = 'P0001';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS versions_sealed_draft ON versions;
CREATE TRIGGER versions_sealed_draft BEFORE INSERT ON versions
  FOR EACH ROW EXECUTE FUNCTION barsmith_versions_sealed_draft();

-- Seals: checked when made, never changed, removed only by a cascade once lifted.
CREATE OR REPLACE FUNCTION barsmith_seals_check() RETURNS trigger AS $$
BEGIN
  IF barsmith_split_total(NEW.split) <> 10000 THEN
    RAISE EXCEPTION 'The split sheet totals % %%; it must total exactly 100.00 %% before the sheet is sealed.', barsmith_percent(barsmith_split_total(NEW.split))
      USING ERRCODE = 'P0001';
  END IF;
  IF barsmith_split_unconfirmed(NEW.split) > 0 THEN
    RAISE EXCEPTION 'Every member listed on the split sheet must confirm their line before the sheet is sealed (% still to confirm).', barsmith_split_unconfirmed(NEW.split)
      USING ERRCODE = 'P0001';
  END IF;
  IF EXISTS (SELECT 1 FROM seals s WHERE s.song_id = NEW.song_id AND s.id <> NEW.id
             AND NOT EXISTS (SELECT 1 FROM seal_lifts l WHERE l.seal_id = s.id)) THEN
    RAISE EXCEPTION 'This song already has a sealed final sheet. The owner must unseal it before another version is sealed.'
      USING ERRCODE = 'P0001';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS seals_check ON seals;
CREATE TRIGGER seals_check BEFORE INSERT ON seals
  FOR EACH ROW EXECUTE FUNCTION barsmith_seals_check();

CREATE OR REPLACE FUNCTION barsmith_seals_immutable() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'UPDATE' THEN
    RAISE EXCEPTION 'A seal never changes: the final sheet sealed on % stays as it was. The owner can unseal it, with a reason.', to_char(OLD.sealed_at, 'YYYY-MM-DD')
      USING ERRCODE = 'P0001';
  END IF;
  IF pg_trigger_depth() < 2 THEN
    RAISE EXCEPTION 'A seal is kept for good and cannot be deleted. The owner can unseal it, with a reason; the seal stays as history.'
      USING ERRCODE = 'P0001';
  END IF;
  IF NOT EXISTS (SELECT 1 FROM seal_lifts l WHERE l.seal_id = OLD.id) THEN
    RAISE EXCEPTION 'This song holds a sealed final sheet (sealed on %): it cannot be deleted until the owner unseals it.', to_char(OLD.sealed_at, 'YYYY-MM-DD')
      USING ERRCODE = 'P0001';
  END IF;
  RETURN OLD;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS seals_immutable ON seals;
CREATE TRIGGER seals_immutable BEFORE UPDATE OR DELETE ON seals
  FOR EACH ROW EXECUTE FUNCTION barsmith_seals_immutable();

-- Lifts: the record of unsealing stays; only foreign keys may clear a removed user or draft.
CREATE OR REPLACE FUNCTION barsmith_seal_lifts_immutable() RETURNS trigger AS $$
BEGIN
  IF pg_trigger_depth() < 2 THEN
    RAISE EXCEPTION 'The record of an unsealing is kept for good and cannot be changed or deleted.'
      USING ERRCODE = 'P0001';
  END IF;
  IF TG_OP = 'UPDATE' AND (NEW.id, NEW.seal_id, NEW.reason, NEW.lifted_by_name, NEW.created_at)
                          IS DISTINCT FROM (OLD.id, OLD.seal_id, OLD.reason, OLD.lifted_by_name, OLD.created_at) THEN
    RAISE EXCEPTION 'The record of an unsealing is kept for good and cannot be changed.'
      USING ERRCODE = 'P0001';
  END IF;
  IF TG_OP = 'DELETE' THEN
    RETURN OLD;
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS seal_lifts_immutable ON seal_lifts;
CREATE TRIGGER seal_lifts_immutable BEFORE UPDATE OR DELETE ON seal_lifts
  FOR EACH ROW EXECUTE FUNCTION barsmith_seal_lifts_immutable();

-- The working split sheet: 100.00 % whenever it has lines, checked at commit.
CREATE OR REPLACE FUNCTION barsmith_split_lines_total() RETURNS trigger AS $$
DECLARE
  v_song uuid := coalesce(NEW.song_id, OLD.song_id);
  v_count bigint;
  v_total bigint;
BEGIN
  SELECT count(*), coalesce(sum(share_bp), 0) INTO v_count, v_total FROM split_lines WHERE song_id = v_song;
  IF v_count > 0 AND v_total <> 10000 THEN
    RAISE EXCEPTION 'The split sheet totals % %%; it must total exactly 100.00 %%.', barsmith_percent(v_total)
      USING ERRCODE = 'P0001';
  END IF;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS split_lines_total ON split_lines;
CREATE CONSTRAINT TRIGGER split_lines_total AFTER INSERT OR UPDATE OR DELETE ON split_lines
  DEFERRABLE INITIALLY DEFERRED
  FOR EACH ROW EXECUTE FUNCTION barsmith_split_lines_total();
