-- The audit trail is append-only: the database itself refuses to change or remove an event, so
-- no code path (a bug, a hand-written query, a future feature) can rewrite the record.
-- TRUNCATE is left alone on purpose: only whole-database resets (test set-up) use it.
CREATE FUNCTION audit_event_refuse_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'audit events are append-only: % refused', TG_OP
    USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER audit_event_append_only
  BEFORE UPDATE OR DELETE ON "audit_event"
  FOR EACH ROW EXECUTE FUNCTION audit_event_refuse_change();
