ALTER TABLE "inspection_answers" ALTER COLUMN "value" SET DATA TYPE numeric;--> statement-breakpoint
ALTER TABLE "inspections" ADD COLUMN "declared_kmh" numeric;