ALTER TABLE "standing_records" ALTER COLUMN "speed" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "standing_records" DROP COLUMN "speed_kmh";--> statement-breakpoint
CREATE TRIGGER "set_asides_signed_immutable" BEFORE UPDATE OR DELETE ON "set_asides" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "set_asides_bump" AFTER INSERT OR UPDATE ON "set_asides" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
--> statement-breakpoint
CREATE TRIGGER "impound_check_ins_append_only" BEFORE UPDATE OR DELETE ON "impound_check_ins" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION "bump_event_version"() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE eid integer;
BEGIN
  IF TG_ARGV[0] = 'direct' THEN eid := NEW.event_id;
  ELSIF TG_ARGV[0] = 'run' THEN SELECT event_id INTO eid FROM runs WHERE id = NEW.run_id;
  ELSIF TG_ARGV[0] = 'course' THEN SELECT event_id INTO eid FROM courses WHERE id = NEW.course_id;
  ELSIF TG_ARGV[0] = 'team' THEN SELECT event_id INTO eid FROM teams WHERE id = NEW.team_id;
  ELSIF TG_ARGV[0] = 'attempt' THEN SELECT event_id INTO eid FROM attempts WHERE id = NEW.attempt_id;
  END IF;
  UPDATE events SET data_version = data_version + 1 WHERE id = eid;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER "impound_check_ins_bump" AFTER INSERT ON "impound_check_ins" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('attempt');
