ALTER TABLE "timing_systems" ADD COLUMN "time_base" text DEFAULT 'local' NOT NULL;--> statement-breakpoint
ALTER TABLE "timing_systems" ADD COLUMN "synchronisation" text DEFAULT '' NOT NULL;