CREATE TYPE "public"."item_result" AS ENUM('pass', 'fail', 'na');--> statement-breakpoint
ALTER TYPE "public"."signed_kind" ADD VALUE 'inspection';--> statement-breakpoint
ALTER TYPE "public"."signed_kind" ADD VALUE 'statement';--> statement-breakpoint
CREATE TABLE "checklists" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"base_id" text NOT NULL,
	"content" jsonb NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "inspection_answers" (
	"id" serial PRIMARY KEY NOT NULL,
	"inspection_id" integer NOT NULL,
	"item_key" text NOT NULL,
	"result" "item_result" NOT NULL,
	"value" numeric(16, 6),
	"entered_as" text,
	"note" text,
	"updated_by" integer NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "inspections" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"entry_id" integer NOT NULL,
	"checklist" jsonb NOT NULL,
	"bus_voltage_v" numeric(7, 1),
	"bus_kind" text,
	"previous_id" integer,
	"signature_id" integer,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "witness_statements" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"attempt_id" integer NOT NULL,
	"author_id" integer NOT NULL,
	"runs_seen" text NOT NULL,
	"position" text NOT NULL,
	"conditions" text NOT NULL,
	"irregularities" text NOT NULL,
	"withdraws_id" integer,
	"reason" text,
	"signature_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "signatures" ADD COLUMN "drawing_png" text;--> statement-breakpoint
ALTER TABLE "checklists" ADD CONSTRAINT "checklists_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checklists" ADD CONSTRAINT "checklists_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspection_answers" ADD CONSTRAINT "inspection_answers_inspection_id_inspections_id_fk" FOREIGN KEY ("inspection_id") REFERENCES "public"."inspections"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspection_answers" ADD CONSTRAINT "inspection_answers_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_statements" ADD CONSTRAINT "witness_statements_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_statements" ADD CONSTRAINT "witness_statements_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_statements" ADD CONSTRAINT "witness_statements_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_statements" ADD CONSTRAINT "witness_statements_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "inspection_answers_item" ON "inspection_answers" USING btree ("inspection_id","item_key");--> statement-breakpoint
CREATE INDEX "inspections_entry" ON "inspections" USING btree ("entry_id");--> statement-breakpoint
CREATE UNIQUE INDEX "statements_withdrawn_once" ON "witness_statements" USING btree ("withdraws_id");
--> statement-breakpoint
CREATE FUNCTION "refuse_change_when_signed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF OLD.signature_id IS NOT NULL THEN
    RAISE EXCEPTION 'signed % rows are immutable: % refused', TG_TABLE_NAME, TG_OP USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "inspections_signed_immutable" BEFORE UPDATE OR DELETE ON "inspections" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "statements_signed_immutable" BEFORE UPDATE OR DELETE ON "witness_statements" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE FUNCTION "refuse_answer_change_when_signed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF (SELECT signature_id FROM inspections WHERE id = COALESCE(NEW.inspection_id, OLD.inspection_id)) IS NOT NULL THEN
    RAISE EXCEPTION 'answers of a signed inspection are immutable: % refused', TG_OP USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER "inspection_answers_signed_immutable" BEFORE INSERT OR UPDATE OR DELETE ON "inspection_answers" FOR EACH ROW EXECUTE FUNCTION "refuse_answer_change_when_signed"();
