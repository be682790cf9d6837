-- A saved version never changes: UPDATE is always refused, and so is a DELETE made directly
-- (a cascade from deleting its song or draft runs inside the foreign key's trigger, depth > 1).
CREATE OR REPLACE FUNCTION barsmith_versions_immutable() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'UPDATE' THEN
    RAISE EXCEPTION 'Version % of this draft is saved for good and cannot be changed. Save a new version instead.', OLD.number
      USING ERRCODE = 'P0001';
  END IF;
  IF pg_trigger_depth() < 2 THEN
    RAISE EXCEPTION 'Version % of this draft is kept for good and cannot be deleted.', OLD.number
      USING ERRCODE = 'P0001';
  END IF;
  RETURN OLD;
END;
$$ LANGUAGE plpgsql;

DROP TRIGGER IF EXISTS versions_immutable ON versions;
CREATE TRIGGER versions_immutable BEFORE UPDATE OR DELETE ON versions
  FOR EACH ROW EXECUTE FUNCTION barsmith_versions_immutable();
