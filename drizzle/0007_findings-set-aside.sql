CREATE TYPE "public"."record_unit" AS ENUM('km/h', 'mph');--> statement-breakpoint
ALTER TYPE "public"."signed_kind" ADD VALUE 'set-aside';--> statement-breakpoint
CREATE TABLE "impound_check_ins" (
	"id" serial PRIMARY KEY NOT NULL,
	"attempt_id" integer NOT NULL,
	"checked_in_at" timestamp with time zone NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"recorded_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "impound_check_ins_attempt_id_unique" UNIQUE("attempt_id")
);
--> statement-breakpoint
CREATE TABLE "set_asides" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"attempt_id" integer NOT NULL,
	"run_id" integer,
	"code" text NOT NULL,
	"finding" text NOT NULL,
	"reason" text NOT NULL,
	"official_id" integer NOT NULL,
	"signature_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "standing_records" ADD COLUMN "speed" numeric;--> statement-breakpoint
ALTER TABLE "standing_records" ADD COLUMN "unit" "record_unit" DEFAULT 'km/h' NOT NULL;--> statement-breakpoint
ALTER TABLE "impound_check_ins" ADD CONSTRAINT "impound_check_ins_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "impound_check_ins" ADD CONSTRAINT "impound_check_ins_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_asides" ADD CONSTRAINT "set_asides_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_asides" ADD CONSTRAINT "set_asides_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_asides" ADD CONSTRAINT "set_asides_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_asides" ADD CONSTRAINT "set_asides_official_id_users_id_fk" FOREIGN KEY ("official_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_asides" ADD CONSTRAINT "set_asides_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
UPDATE "standing_records" SET "speed" = "speed_kmh", "unit" = 'km/h';