ALTER TABLE "dossiers" ADD COLUMN "public_pdf_sha256" text;--> statement-breakpoint
ALTER TABLE "dossiers" ADD COLUMN "public_pdf_size" bigint;--> statement-breakpoint
ALTER TABLE "dossiers" ADD COLUMN "public_manifest_sha256" text;