ALTER TYPE "public"."signed_kind" ADD VALUE 'post-run-check';--> statement-breakpoint
CREATE TABLE "post_run_checks" (
	"id" serial PRIMARY KEY NOT NULL,
	"attempt_id" integer NOT NULL,
	"mass_kg" numeric(8, 1),
	"note" text DEFAULT '' NOT NULL,
	"scrutineer_id" integer NOT NULL,
	"signature_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "post_run_checks_attempt_id_unique" UNIQUE("attempt_id")
);
--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD CONSTRAINT "post_run_checks_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD CONSTRAINT "post_run_checks_scrutineer_id_users_id_fk" FOREIGN KEY ("scrutineer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD CONSTRAINT "post_run_checks_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE TRIGGER "post_run_checks_signed_immutable" BEFORE UPDATE OR DELETE ON "post_run_checks" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "post_run_checks_no_truncate" BEFORE TRUNCATE ON "post_run_checks" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
