-- An issued report never changes: its bytes, hash, signature and signers are what was issued.
-- The only change allowed is marking it superseded, once; deleting one is refused.
CREATE OR REPLACE FUNCTION reports_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'issued reports cannot be deleted (report %)', OLD.id;
  END IF;
  IF (to_jsonb(NEW) - 'superseded_by' - 'superseded_at') IS DISTINCT FROM (to_jsonb(OLD) - 'superseded_by' - 'superseded_at') THEN
    RAISE EXCEPTION 'issued reports cannot be changed (report %)', OLD.id;
  END IF;
  IF OLD.superseded_by IS NOT NULL AND (NEW.superseded_by IS DISTINCT FROM OLD.superseded_by OR NEW.superseded_at IS DISTINCT FROM OLD.superseded_at) THEN
    RAISE EXCEPTION 'report % is already superseded', OLD.id;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER reports_immutable BEFORE UPDATE OR DELETE ON reports FOR EACH ROW EXECUTE FUNCTION reports_immutable();
