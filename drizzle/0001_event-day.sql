CREATE TYPE "public"."run_direction" AS ENUM('out', 'back');--> statement-breakpoint
CREATE TYPE "public"."run_status" AS ENUM('open', 'finished', 'aborted');--> statement-breakpoint
CREATE TYPE "public"."signed_kind" AS ENUM('timing-sheet', 'timing-sheet-reopened');--> statement-breakpoint
CREATE TYPE "public"."start_kind" AS ENUM('flying', 'standing');--> statement-breakpoint
CREATE TYPE "public"."system_role" AS ENUM('primary', 'backup');--> statement-breakpoint
CREATE TABLE "attempts" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"entry_id" integer NOT NULL,
	"profile" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "entries" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"team_id" integer NOT NULL,
	"machine_id" integer NOT NULL,
	"rider_id" integer NOT NULL,
	"class_name" text NOT NULL,
	"distance_id" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "measured_distances" (
	"id" serial PRIMARY KEY NOT NULL,
	"course_id" integer NOT NULL,
	"label" text NOT NULL,
	"start" "start_kind" NOT NULL,
	"nominal_m" numeric(12, 3) NOT NULL,
	"entry_trap_id" integer NOT NULL,
	"exit_trap_id" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "readings" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"run_id" integer NOT NULL,
	"trap_id" integer NOT NULL,
	"system_id" integer NOT NULL,
	"ticks" bigint NOT NULL,
	"supersedes_id" bigint,
	"reason" text,
	"entered_by" integer NOT NULL,
	"entered_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "runs" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"attempt_id" integer NOT NULL,
	"direction" "run_direction" NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"status" "run_status" DEFAULT 'open' NOT NULL,
	"aborted_reason" text,
	"aborted_by" integer,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "signatures" (
	"id" serial PRIMARY KEY NOT NULL,
	"kind" "signed_kind" NOT NULL,
	"subject_id" integer NOT NULL,
	"event_id" integer NOT NULL,
	"signer_id" integer NOT NULL,
	"typed_name" text NOT NULL,
	"content" jsonb NOT NULL,
	"content_sha256" text NOT NULL,
	"reason" text,
	"supersedes_id" integer,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "standing_records" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"class_name" text NOT NULL,
	"distance_label" text NOT NULL,
	"speed_kmh" numeric(10, 3) NOT NULL,
	"set_on" date,
	"note" text DEFAULT '' NOT NULL
);
--> statement-breakpoint
CREATE TABLE "timing_systems" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"name" text NOT NULL,
	"role" "system_role" NOT NULL,
	"ticks_per_second" integer NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"tolerance_s" numeric(8, 6) NOT NULL,
	"calibrated_on" date NOT NULL,
	"calibration_expires" date NOT NULL
);
--> statement-breakpoint
CREATE TABLE "weather" (
	"id" serial PRIMARY KEY NOT NULL,
	"run_id" integer NOT NULL,
	"wind_speed_ms" numeric(6, 2) NOT NULL,
	"wind_from_deg" numeric(6, 2) NOT NULL,
	"temperature_c" numeric(5, 1),
	"pressure_hpa" numeric(6, 1),
	"entered_by" integer NOT NULL,
	"entered_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "courses" ADD COLUMN "survey_tolerance_mm" integer DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "attempts" ADD CONSTRAINT "attempts_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attempts" ADD CONSTRAINT "attempts_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_machine_id_machines_id_fk" FOREIGN KEY ("machine_id") REFERENCES "public"."machines"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_rider_id_riders_id_fk" FOREIGN KEY ("rider_id") REFERENCES "public"."riders"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_distance_id_measured_distances_id_fk" FOREIGN KEY ("distance_id") REFERENCES "public"."measured_distances"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measured_distances" ADD CONSTRAINT "measured_distances_course_id_courses_id_fk" FOREIGN KEY ("course_id") REFERENCES "public"."courses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measured_distances" ADD CONSTRAINT "measured_distances_entry_trap_id_traps_id_fk" FOREIGN KEY ("entry_trap_id") REFERENCES "public"."traps"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measured_distances" ADD CONSTRAINT "measured_distances_exit_trap_id_traps_id_fk" FOREIGN KEY ("exit_trap_id") REFERENCES "public"."traps"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_trap_id_traps_id_fk" FOREIGN KEY ("trap_id") REFERENCES "public"."traps"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_system_id_timing_systems_id_fk" FOREIGN KEY ("system_id") REFERENCES "public"."timing_systems"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_entered_by_users_id_fk" FOREIGN KEY ("entered_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_aborted_by_users_id_fk" FOREIGN KEY ("aborted_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signatures" ADD CONSTRAINT "signatures_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signatures" ADD CONSTRAINT "signatures_signer_id_users_id_fk" FOREIGN KEY ("signer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "standing_records" ADD CONSTRAINT "standing_records_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "timing_systems" ADD CONSTRAINT "timing_systems_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "weather" ADD CONSTRAINT "weather_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "weather" ADD CONSTRAINT "weather_entered_by_users_id_fk" FOREIGN KEY ("entered_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "distances_course_label" ON "measured_distances" USING btree ("course_id","label");--> statement-breakpoint
CREATE INDEX "readings_run" ON "readings" USING btree ("run_id");--> statement-breakpoint
CREATE UNIQUE INDEX "readings_supersedes_once" ON "readings" USING btree ("supersedes_id");--> statement-breakpoint
CREATE UNIQUE INDEX "readings_first_entry" ON "readings" USING btree ("run_id","trap_id","system_id") WHERE supersedes_id is null;--> statement-breakpoint
CREATE INDEX "runs_event" ON "runs" USING btree ("event_id");--> statement-breakpoint
CREATE INDEX "signatures_subject" ON "signatures" USING btree ("kind","subject_id");--> statement-breakpoint
CREATE UNIQUE INDEX "signatures_supersedes_once" ON "signatures" USING btree ("supersedes_id");--> statement-breakpoint
CREATE UNIQUE INDEX "standing_records_event_class_distance" ON "standing_records" USING btree ("event_id","class_name","distance_label");--> statement-breakpoint
CREATE UNIQUE INDEX "timing_systems_event_role" ON "timing_systems" USING btree ("event_id","role");--> statement-breakpoint
CREATE FUNCTION "refuse_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% rows are append-only: % refused', TG_TABLE_NAME, TG_OP USING ERRCODE = 'integrity_constraint_violation';
END $$;
--> statement-breakpoint
CREATE TRIGGER "readings_append_only" BEFORE UPDATE OR DELETE ON "readings" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
--> statement-breakpoint
CREATE TRIGGER "weather_append_only" BEFORE UPDATE OR DELETE ON "weather" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
--> statement-breakpoint
CREATE TRIGGER "signatures_append_only" BEFORE UPDATE OR DELETE ON "signatures" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
