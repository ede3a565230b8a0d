-- alarm_events is the lifecycle record: rows are appended, never changed. Deleting is refused
-- too, except when a cascade from a deleted tag or site removes the whole history with it.
CREATE FUNCTION alarm_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' AND pg_trigger_depth() > 1 THEN
    RETURN OLD;
  END IF;
  RAISE EXCEPTION 'alarm_events is append-only (% refused)', TG_OP USING ERRCODE = 'insufficient_privilege';
END $$;
--> statement-breakpoint
CREATE TRIGGER alarm_events_append_only BEFORE UPDATE OR DELETE ON alarm_events
  FOR EACH ROW EXECUTE FUNCTION alarm_events_append_only();
