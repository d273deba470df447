ALTER TYPE "public"."signed_kind" ADD VALUE 'suspension';--> statement-breakpoint
CREATE TABLE "machine_suspensions" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"machine_id" integer NOT NULL,
	"reason" text NOT NULL,
	"scrutineer_id" integer NOT NULL,
	"signature_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "machine_suspensions" ADD CONSTRAINT "machine_suspensions_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_suspensions" ADD CONSTRAINT "machine_suspensions_machine_id_machines_id_fk" FOREIGN KEY ("machine_id") REFERENCES "public"."machines"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_suspensions" ADD CONSTRAINT "machine_suspensions_scrutineer_id_users_id_fk" FOREIGN KEY ("scrutineer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_suspensions" ADD CONSTRAINT "machine_suspensions_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE TRIGGER "machine_suspensions_signed_immutable" BEFORE UPDATE OR DELETE ON "machine_suspensions" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "machine_suspensions_no_truncate" BEFORE TRUNCATE ON "machine_suspensions" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
--> statement-breakpoint
CREATE TRIGGER "machine_suspensions_bump" AFTER INSERT OR UPDATE ON "machine_suspensions" FOR EACH ROW EXECUTE FUNCTION "bump_event_version"('direct');
