CREATE TABLE "passkey_revocations" (
	"id" serial PRIMARY KEY NOT NULL,
	"passkey_id" integer NOT NULL,
	"reason" text NOT NULL,
	"revoked_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "passkey_revocations_passkey_id_unique" UNIQUE("passkey_id")
);
--> statement-breakpoint
CREATE TABLE "signing_challenges" (
	"id" serial PRIMARY KEY NOT NULL,
	"user_id" integer NOT NULL,
	"kind" text NOT NULL,
	"digest" text NOT NULL,
	"nonce" text NOT NULL,
	"challenge" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	CONSTRAINT "signing_challenges_challenge_unique" UNIQUE("challenge")
);
--> statement-breakpoint
ALTER TABLE "passkey_revocations" ADD CONSTRAINT "passkey_revocations_passkey_id_passkeys_id_fk" FOREIGN KEY ("passkey_id") REFERENCES "public"."passkeys"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_challenges" ADD CONSTRAINT "signing_challenges_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE TRIGGER "passkey_revocations_append_only" BEFORE UPDATE OR DELETE ON "passkey_revocations" FOR EACH ROW EXECUTE FUNCTION "refuse_change"();
--> statement-breakpoint
CREATE TRIGGER "passkey_revocations_no_truncate" BEFORE TRUNCATE ON "passkey_revocations" FOR EACH STATEMENT EXECUTE FUNCTION "refuse_truncate"();
