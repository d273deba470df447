-- Every new version of an event's live results is announced on channel trapline_live as "<event id>:<version>",
-- delivered at commit to every app server that listens (LISTEN/NOTIFY), so pushed results work across servers.
CREATE FUNCTION "notify_event_version"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('trapline_live', NEW.id::text || ':' || NEW.data_version::text);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER "events_notify" AFTER UPDATE ON "events" FOR EACH ROW
  WHEN (OLD.data_version IS DISTINCT FROM NEW.data_version) EXECUTE FUNCTION "notify_event_version"();
