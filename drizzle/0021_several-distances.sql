CREATE TABLE "withdrawals" (
	"id" serial PRIMARY KEY NOT NULL,
	"dossier_id" integer NOT NULL,
	"reason" text NOT NULL,
	"withdrawn_by" integer NOT NULL,
	"withdrawn_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "withdrawals_dossier_id_unique" UNIQUE("dossier_id")
);
--> statement-breakpoint
DROP INDEX "dossiers_attempt_version";--> statement-breakpoint
ALTER TABLE "dossiers" ADD COLUMN "distance_id" integer;--> statement-breakpoint
-- Every dossier sealed so far claimed its entry's one distance.
ALTER TABLE "dossiers" DISABLE TRIGGER "dossiers_append_only";--> statement-breakpoint
UPDATE "dossiers" d SET "distance_id" = e."distance_id" FROM "attempts" a JOIN "entries" e ON e."id" = a."entry_id" WHERE a."id" = d."attempt_id";--> statement-breakpoint
ALTER TABLE "dossiers" ENABLE TRIGGER "dossiers_append_only";--> statement-breakpoint
ALTER TABLE "dossiers" ALTER COLUMN "distance_id" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "entries" ADD COLUMN "distance_ids" integer[];--> statement-breakpoint
UPDATE "entries" SET "distance_ids" = ARRAY["distance_id"];--> statement-breakpoint
ALTER TABLE "entries" ALTER COLUMN "distance_ids" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "start" "start_kind" DEFAULT 'flying' NOT NULL;--> statement-breakpoint
ALTER TABLE "standing_records" ADD COLUMN "minimum" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "withdrawals" ADD CONSTRAINT "withdrawals_dossier_id_dossiers_id_fk" FOREIGN KEY ("dossier_id") REFERENCES "public"."dossiers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "withdrawals" ADD CONSTRAINT "withdrawals_withdrawn_by_users_id_fk" FOREIGN KEY ("withdrawn_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dossiers" ADD CONSTRAINT "dossiers_distance_id_measured_distances_id_fk" FOREIGN KEY ("distance_id") REFERENCES "public"."measured_distances"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "dossiers_attempt_distance_version" ON "dossiers" USING btree ("attempt_id","distance_id","version");--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_first_claim" CHECK ("entries"."distance_ids"[1] = "entries"."distance_id");--> statement-breakpoint
CREATE TRIGGER "withdrawals_append_only" BEFORE UPDATE OR DELETE ON "withdrawals" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
--> statement-breakpoint
CREATE TRIGGER "withdrawals_no_truncate" BEFORE TRUNCATE ON "withdrawals" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
