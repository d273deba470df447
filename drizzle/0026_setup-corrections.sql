CREATE TABLE "entry_change_requests" (
	"id" serial PRIMARY KEY NOT NULL,
	"entry_id" integer NOT NULL,
	"changes" jsonb NOT NULL,
	"reason" text NOT NULL,
	"requested_by" integer NOT NULL,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"status" text DEFAULT 'pending' NOT NULL,
	"decided_by" integer,
	"decided_at" timestamp with time zone,
	"decision_note" text
);
--> statement-breakpoint
CREATE TABLE "setup_changes" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"subject" text NOT NULL,
	"subject_id" integer NOT NULL,
	"action" text NOT NULL,
	"before" jsonb NOT NULL,
	"after" jsonb,
	"reason" text NOT NULL,
	"changed_by" integer NOT NULL,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
DROP INDEX "distances_course_label";--> statement-breakpoint
DROP INDEX "standing_records_event_class_distance";--> statement-breakpoint
DROP INDEX "timing_systems_event_role";--> statement-breakpoint
DROP INDEX "traps_course_label";--> statement-breakpoint
ALTER TABLE "measured_distances" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "standing_records" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "timing_systems" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "traps" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "entry_change_requests" ADD CONSTRAINT "entry_change_requests_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entry_change_requests" ADD CONSTRAINT "entry_change_requests_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entry_change_requests" ADD CONSTRAINT "entry_change_requests_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "setup_changes" ADD CONSTRAINT "setup_changes_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "setup_changes" ADD CONSTRAINT "setup_changes_changed_by_users_id_fk" FOREIGN KEY ("changed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "setup_changes_subject" ON "setup_changes" USING btree ("event_id","subject","subject_id");--> statement-breakpoint
CREATE UNIQUE INDEX "distances_course_label" ON "measured_distances" USING btree ("course_id","label") WHERE retired_at is null;--> statement-breakpoint
CREATE UNIQUE INDEX "standing_records_event_class_distance" ON "standing_records" USING btree ("event_id","class_name","distance_label") WHERE dossier_id is null and retired_at is null;--> statement-breakpoint
CREATE UNIQUE INDEX "timing_systems_event_role" ON "timing_systems" USING btree ("event_id","role") WHERE retired_at is null;--> statement-breakpoint
CREATE UNIQUE INDEX "traps_course_label" ON "traps" USING btree ("course_id","label") WHERE retired_at is null;--> statement-breakpoint
CREATE TRIGGER "setup_changes_append_only" BEFORE UPDATE OR DELETE ON "setup_changes" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
