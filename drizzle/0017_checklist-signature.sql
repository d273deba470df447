ALTER TYPE "public"."signed_kind" ADD VALUE 'checklist';--> statement-breakpoint
ALTER TABLE "checklists" ADD COLUMN "signature_id" integer;--> statement-breakpoint
ALTER TABLE "checklists" ADD CONSTRAINT "checklists_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE TRIGGER "checklists_signed_immutable" BEFORE UPDATE OR DELETE ON "checklists" FOR EACH ROW EXECUTE FUNCTION "refuse_change_when_signed"();
--> statement-breakpoint
CREATE TRIGGER "checklists_no_truncate" BEFORE TRUNCATE ON "checklists" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
