DROP INDEX "standing_records_event_class_distance";--> statement-breakpoint
ALTER TABLE "standing_records" ADD COLUMN "dossier_id" integer;--> statement-breakpoint
ALTER TABLE "standing_records" ADD COLUMN "set_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "standing_records" ADD CONSTRAINT "standing_records_dossier_id_dossiers_id_fk" FOREIGN KEY ("dossier_id") REFERENCES "public"."dossiers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "standing_records_event_class_distance" ON "standing_records" USING btree ("event_id","class_name","distance_label") WHERE dossier_id is null;