ALTER TABLE "inspections" ADD COLUMN "division" "streamlining";--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD COLUMN "capacity_cm3" numeric(8, 2);--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD COLUMN "seal_numbers" text[] DEFAULT '{}'::text[] NOT NULL;--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD COLUMN "seals_intact" boolean;--> statement-breakpoint
ALTER TABLE "post_run_checks" ADD CONSTRAINT "post_run_checks_seals_said" CHECK ((cardinality("post_run_checks"."seal_numbers") = 0) = ("post_run_checks"."seals_intact" IS NULL));