-- TRUNCATE skips row triggers: the records that are never deleted refuse it with a statement trigger too.
CREATE FUNCTION "refuse_truncate"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% rows are never deleted: TRUNCATE refused', TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
END $$;
--> statement-breakpoint
CREATE TRIGGER "decisions_no_truncate" BEFORE TRUNCATE ON "decisions" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "dossiers_no_truncate" BEFORE TRUNCATE ON "dossiers" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "evidence_no_truncate" BEFORE TRUNCATE ON "evidence" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "impound_check_ins_no_truncate" BEFORE TRUNCATE ON "impound_check_ins" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "inspection_answers_no_truncate" BEFORE TRUNCATE ON "inspection_answers" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "inspections_no_truncate" BEFORE TRUNCATE ON "inspections" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "readings_no_truncate" BEFORE TRUNCATE ON "readings" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "set_asides_no_truncate" BEFORE TRUNCATE ON "set_asides" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "signatures_no_truncate" BEFORE TRUNCATE ON "signatures" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "weather_no_truncate" BEFORE TRUNCATE ON "weather" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "witness_statements_no_truncate" BEFORE TRUNCATE ON "witness_statements" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "standing_records_no_truncate" BEFORE TRUNCATE ON "standing_records" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "runs_no_truncate" BEFORE TRUNCATE ON "runs" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "attempts_no_truncate" BEFORE TRUNCATE ON "attempts" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
