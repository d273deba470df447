-- What is signed, decided or frozen is never rewritten, whoever connects: ending or revoking is a new row or a
-- column set once. Each function names its table and what it refuses.
CREATE FUNCTION "protests_decided_once"() RETURNS trigger LANGUAGE plpgsql AS $$
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
      NEW.decided_at, NEW.decision_signature_id) IS DISTINCT FROM (OLD.heard_at, OLD.present, OLD.hearing, OLD.outcome,
      OLD.reasons, OLD.decided_by, OLD.decided_at, OLD.decision_signature_id) THEN
    RAISE EXCEPTION 'a decided protest is decided once: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "protests_decided_once" BEFORE UPDATE OR DELETE ON "protests" FOR EACH ROW EXECUTE FUNCTION "protests_decided_once"();
--> statement-breakpoint
CREATE TRIGGER "protests_no_truncate" BEFORE TRUNCATE ON "protests" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "notices_signed_immutable" BEFORE UPDATE OR DELETE ON "notices" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "notices_no_truncate" BEFORE TRUNCATE ON "notices" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "briefing_sign_ons_signed_immutable" BEFORE UPDATE OR DELETE ON "briefing_sign_ons" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "briefing_sign_ons_no_truncate" BEFORE TRUNCATE ON "briefing_sign_ons" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "start_overrides_signed_immutable" BEFORE UPDATE OR DELETE ON "start_overrides" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "start_overrides_no_truncate" BEFORE TRUNCATE ON "start_overrides" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE FUNCTION "appointments_end_once"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'appointments rows are never deleted (an appointment is ended): DELETE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF OLD.ended_at IS NOT NULL
     OR (NEW.event_id, NEW.function, NEW.user_id, NEW.appointed_by, NEW.appointed_at)
        IS DISTINCT FROM (OLD.event_id, OLD.function, OLD.user_id, OLD.appointed_by, OLD.appointed_at) THEN
    RAISE EXCEPTION 'an appointment is only ended, once: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "appointments_end_once" BEFORE UPDATE OR DELETE ON "appointments" FOR EACH ROW EXECUTE FUNCTION "appointments_end_once"();
--> statement-breakpoint
CREATE TRIGGER "appointments_no_truncate" BEFORE TRUNCATE ON "appointments" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE FUNCTION "passkeys_key_fixed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF (NEW.user_id, NEW.credential_id, NEW.public_key, NEW.created_at)
     IS DISTINCT FROM (OLD.user_id, OLD.credential_id, OLD.public_key, OLD.created_at) THEN
    RAISE EXCEPTION 'a passkey''s owner and public key never change (what it signed stays verifiable): UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "passkeys_key_fixed" BEFORE UPDATE ON "passkeys" FOR EACH ROW EXECUTE FUNCTION "passkeys_key_fixed"();
--> statement-breakpoint
CREATE FUNCTION "seal_keys_retire_once"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF OLD.retired_at IS NOT NULL
     OR (NEW.key_id, NEW.public_key_pem, NEW.certificate_pem, NEW.certificate_sha256, NEW.first_used_at)
        IS DISTINCT FROM (OLD.key_id, OLD.public_key_pem, OLD.certificate_pem, OLD.certificate_sha256, OLD.first_used_at) THEN
    RAISE EXCEPTION 'a seal key is only retired, once: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "seal_keys_retire_once" BEFORE UPDATE ON "seal_keys" FOR EACH ROW EXECUTE FUNCTION "seal_keys_retire_once"();
--> statement-breakpoint
CREATE FUNCTION "attempts_profile_frozen"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'attempts rows are never deleted: DELETE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.profile IS DISTINCT FROM OLD.profile THEN
    RAISE EXCEPTION 'an attempt''s rule profile is frozen when it is made: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "attempts_profile_frozen" BEFORE UPDATE OR DELETE ON "attempts" FOR EACH ROW EXECUTE FUNCTION "attempts_profile_frozen"();
--> statement-breakpoint
CREATE FUNCTION "standing_records_kept"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'standing_records rows are never deleted (a record is retired): DELETE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF OLD.dossier_id IS NOT NULL THEN
    RAISE EXCEPTION 'a ratified record is never edited: UPDATE refused' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "standing_records_kept" BEFORE UPDATE OR DELETE ON "standing_records" FOR EACH ROW EXECUTE FUNCTION "standing_records_kept"();
--> statement-breakpoint
-- A steward signs a set-aside once: the stewards' quorum counts people, not signatures (the code checks it under
-- the attempt's lock; this is the backstop). A trigger, since an enum value added in an earlier migration of the same
-- run cannot be named in an index predicate.
CREATE FUNCTION "set_aside_signed_once_per_steward"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.kind = 'set-aside' AND EXISTS (SELECT 1 FROM signatures s WHERE s.kind = 'set-aside'
     AND s.subject_id = NEW.subject_id AND s.signer_id = NEW.signer_id) THEN
    RAISE EXCEPTION 'a steward signs a set-aside once: INSERT refused' USING ERRCODE = 'unique_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "set_aside_signed_once_per_steward" BEFORE INSERT ON "signatures" FOR EACH ROW EXECUTE FUNCTION "set_aside_signed_once_per_steward"();
