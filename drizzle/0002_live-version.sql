ALTER TABLE "events" ADD COLUMN "data_version" bigint DEFAULT 0 NOT NULL;
--> statement-breakpoint
CREATE FUNCTION "bump_event_version"() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE eid integer;
BEGIN
  IF TG_ARGV[0] = 'direct' THEN eid := NEW.event_id;
  ELSIF TG_ARGV[0] = 'run' THEN SELECT event_id INTO eid FROM runs WHERE id = NEW.run_id;
  ELSIF TG_ARGV[0] = 'course' THEN SELECT event_id INTO eid FROM courses WHERE id = NEW.course_id;
  ELSIF TG_ARGV[0] = 'team' THEN SELECT event_id INTO eid FROM teams WHERE id = NEW.team_id;
  END IF;
  UPDATE events SET data_version = data_version + 1 WHERE id = eid;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER "readings_bump" AFTER INSERT ON "readings" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('run');
--> statement-breakpoint
CREATE TRIGGER "weather_bump" AFTER INSERT ON "weather" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('run');
--> statement-breakpoint
CREATE TRIGGER "runs_bump" AFTER INSERT OR UPDATE ON "runs" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "attempts_bump" AFTER INSERT OR UPDATE ON "attempts" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "entries_bump" AFTER INSERT OR UPDATE ON "entries" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "signatures_bump" AFTER INSERT ON "signatures" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "standing_records_bump" AFTER INSERT OR UPDATE ON "standing_records" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "timing_systems_bump" AFTER INSERT OR UPDATE ON "timing_systems" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "courses_bump" AFTER INSERT OR UPDATE ON "courses" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "traps_bump" AFTER INSERT OR UPDATE ON "traps" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('course');
--> statement-breakpoint
CREATE TRIGGER "distances_bump" AFTER INSERT OR UPDATE ON "measured_distances" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('course');
--> statement-breakpoint
CREATE TRIGGER "machines_bump" AFTER INSERT OR UPDATE ON "machines" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('team');
--> statement-breakpoint
CREATE TRIGGER "riders_bump" AFTER INSERT OR UPDATE ON "riders" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('team');
--> statement-breakpoint
CREATE FUNCTION "bump_own_version"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  NEW.data_version := OLD.data_version + 1;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "events_bump" BEFORE UPDATE OF "profile", "name", "time_zone" ON "events" FOR EACH ROW EXECUTE FUNCTION "bump_own_version"();
