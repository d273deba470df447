ALTER TABLE "protests" ADD COLUMN "voids" text;--> statement-breakpoint
ALTER TABLE "protests" ADD COLUMN "void_run_id" integer;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_void_run_id_runs_id_fk" FOREIGN KEY ("void_run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
-- What a decision makes void is part of the decision: set once with it, never after.
CREATE OR REPLACE FUNCTION "protests_decided_once"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'protests rows are never deleted: DELETE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF (NEW.event_id, NEW.attempt_id, NEW.appeal_of, NEW.kind, NEW.grounds, NEW.team_id, NEW.lodged_by, NEW.lodged_at,
      NEW.published_at, NEW.deadline, NEW.fee_note)
     IS DISTINCT FROM (OLD.event_id, OLD.attempt_id, OLD.appeal_of, OLD.kind, OLD.grounds, OLD.team_id, OLD.lodged_by,
      OLD.lodged_at, OLD.published_at, OLD.deadline, OLD.fee_note) THEN
    RAISE EXCEPTION 'a lodged protest is never edited: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF OLD.signature_id IS NOT NULL AND NEW.signature_id IS DISTINCT FROM OLD.signature_id THEN
    RAISE EXCEPTION 'a signed protest keeps its signature: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF OLD.decided_at IS NOT NULL AND (NEW.heard_at, NEW.present, NEW.hearing, NEW.outcome, NEW.reasons, NEW.decided_by,
      NEW.decided_at, NEW.decision_signature_id, NEW.voids, NEW.void_run_id) IS DISTINCT FROM (OLD.heard_at, OLD.present,
      OLD.hearing, OLD.outcome, OLD.reasons, OLD.decided_by, OLD.decided_at, OLD.decision_signature_id, OLD.voids,
      OLD.void_run_id) THEN
    RAISE EXCEPTION 'a decided protest is decided once: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
