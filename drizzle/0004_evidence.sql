CREATE TYPE "public"."evidence_kind" AS ENUM('survey-certificate', 'calibration-certificate', 'scale-certificate', 'rider-licence', 'photo', 'video', 'data-log', 'other-document');--> statement-breakpoint
CREATE TABLE "evidence" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"kind" "evidence_kind" NOT NULL,
	"original_name" text NOT NULL,
	"media_type" text NOT NULL,
	"size" bigint NOT NULL,
	"sha256" text NOT NULL,
	"course_id" integer,
	"timing_system_id" integer,
	"entry_id" integer,
	"attempt_id" integer,
	"run_id" integer,
	"inspection_id" integer,
	"item_key" text,
	"uploaded_by" integer NOT NULL,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_course_id_courses_id_fk" FOREIGN KEY ("course_id") REFERENCES "public"."courses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_timing_system_id_timing_systems_id_fk" FOREIGN KEY ("timing_system_id") REFERENCES "public"."timing_systems"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_inspection_id_inspections_id_fk" FOREIGN KEY ("inspection_id") REFERENCES "public"."inspections"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "evidence" ADD CONSTRAINT "evidence_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "evidence_event" ON "evidence" USING btree ("event_id");--> statement-breakpoint
CREATE INDEX "evidence_sha256" ON "evidence" USING btree ("sha256");
--> statement-breakpoint
CREATE TRIGGER "evidence_append_only" BEFORE UPDATE OR DELETE ON "evidence" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
