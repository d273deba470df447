ALTER TYPE "public"."signed_kind" ADD VALUE 'homologation';--> statement-breakpoint
CREATE TABLE "homologations" (
	"id" serial PRIMARY KEY NOT NULL,
	"dossier_id" integer NOT NULL,
	"reference" text NOT NULL,
	"homologated_on" date NOT NULL,
	"official_id" integer NOT NULL,
	"signature_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "homologations_dossier_id_unique" UNIQUE("dossier_id")
);
--> statement-breakpoint
ALTER TABLE "homologations" ADD CONSTRAINT "homologations_dossier_id_dossiers_id_fk" FOREIGN KEY ("dossier_id") REFERENCES "public"."dossiers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "homologations" ADD CONSTRAINT "homologations_official_id_users_id_fk" FOREIGN KEY ("official_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "homologations" ADD CONSTRAINT "homologations_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE TRIGGER "homologations_signed_immutable" BEFORE UPDATE OR DELETE ON "homologations" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "homologations_no_truncate" BEFORE TRUNCATE ON "homologations" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
