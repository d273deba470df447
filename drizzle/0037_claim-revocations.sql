ALTER TYPE "public"."signed_kind" ADD VALUE 'revocation';--> statement-breakpoint
CREATE TABLE "claim_revocations" (
	"id" serial PRIMARY KEY NOT NULL,
	"dossier_id" integer NOT NULL,
	"reason" text NOT NULL,
	"revoked_by" integer NOT NULL,
	"signature_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "claim_revocations_dossier_id_unique" UNIQUE("dossier_id")
);
--> statement-breakpoint
ALTER TABLE "claim_revocations" ADD CONSTRAINT "claim_revocations_dossier_id_dossiers_id_fk" FOREIGN KEY ("dossier_id") REFERENCES "public"."dossiers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "claim_revocations" ADD CONSTRAINT "claim_revocations_revoked_by_users_id_fk" FOREIGN KEY ("revoked_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "claim_revocations" ADD CONSTRAINT "claim_revocations_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE TRIGGER "claim_revocations_signed_immutable" BEFORE UPDATE OR DELETE ON "claim_revocations" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "claim_revocations_no_truncate" BEFORE TRUNCATE ON "claim_revocations" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
