CREATE TABLE "seal_keys" (
	"key_id" text PRIMARY KEY NOT NULL,
	"public_key_pem" text NOT NULL,
	"certificate_pem" text,
	"certificate_sha256" text,
	"first_used_at" timestamp with time zone DEFAULT now() NOT NULL,
	"retired_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TRIGGER "seal_keys_never_deleted" BEFORE DELETE ON "seal_keys" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
--> statement-breakpoint
CREATE TRIGGER "seal_keys_no_truncate" BEFORE TRUNCATE ON "seal_keys" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
