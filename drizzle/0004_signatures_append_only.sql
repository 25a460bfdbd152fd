-- Signatures and their voids are append-only: refuse UPDATE and DELETE at the database.
CREATE FUNCTION refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% is append-only (% refused)', TG_TABLE_NAME, TG_OP;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER signatures_append_only BEFORE UPDATE OR DELETE ON signatures
  FOR EACH ROW EXECUTE FUNCTION refuse_change();
--> statement-breakpoint
CREATE TRIGGER signature_voids_append_only BEFORE UPDATE OR DELETE ON signature_voids
  FOR EACH ROW EXECUTE FUNCTION refuse_change();
