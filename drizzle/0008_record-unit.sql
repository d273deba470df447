ALTER TABLE "standing_records" ALTER COLUMN "speed" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "standing_records" DROP COLUMN "speed_kmh";