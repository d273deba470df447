CREATE TABLE "device_layouts" (
	"timing_system_id" integer PRIMARY KEY NOT NULL,
	"layout" jsonb NOT NULL,
	"updated_by" integer NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "readings" ADD COLUMN "source_evidence_id" integer;--> statement-breakpoint
ALTER TABLE "device_layouts" ADD CONSTRAINT "device_layouts_timing_system_id_timing_systems_id_fk" FOREIGN KEY ("timing_system_id") REFERENCES "public"."timing_systems"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "device_layouts" ADD CONSTRAINT "device_layouts_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_source_evidence_id_evidence_id_fk" FOREIGN KEY ("source_evidence_id") REFERENCES "public"."evidence"("id") ON DELETE no action ON UPDATE no action;