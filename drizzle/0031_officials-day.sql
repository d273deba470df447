ALTER TYPE "public"."signed_kind" ADD VALUE 'start-override';--> statement-breakpoint
ALTER TYPE "public"."signed_kind" ADD VALUE 'briefing-sign-on';--> statement-breakpoint
ALTER TYPE "public"."signed_kind" ADD VALUE 'protest';--> statement-breakpoint
ALTER TYPE "public"."signed_kind" ADD VALUE 'protest-decision';--> statement-breakpoint
CREATE TABLE "briefing_sign_ons" (
	"id" serial PRIMARY KEY NOT NULL,
	"briefing_id" integer NOT NULL,
	"rider_id" integer,
	"user_id" integer,
	"name" text NOT NULL,
	"on_device" text NOT NULL,
	"signature_id" integer,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "briefings" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"title" text NOT NULL,
	"held_at" timestamp with time zone NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "protests" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"attempt_id" integer NOT NULL,
	"appeal_of" integer,
	"kind" text NOT NULL,
	"grounds" text NOT NULL,
	"team_id" integer NOT NULL,
	"lodged_by" integer NOT NULL,
	"lodged_at" timestamp with time zone NOT NULL,
	"published_at" timestamp with time zone NOT NULL,
	"deadline" timestamp with time zone NOT NULL,
	"fee_note" text,
	"signature_id" integer,
	"heard_at" timestamp with time zone,
	"present" text,
	"hearing" text,
	"outcome" text,
	"reasons" text,
	"decided_by" integer,
	"decided_at" timestamp with time zone,
	"decision_signature_id" integer
);
--> statement-breakpoint
CREATE TABLE "start_overrides" (
	"id" serial PRIMARY KEY NOT NULL,
	"event_id" integer NOT NULL,
	"entry_id" integer NOT NULL,
	"day" date NOT NULL,
	"codes" text[] NOT NULL,
	"reason" text NOT NULL,
	"signature_id" integer,
	"created_by" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "riders" ADD COLUMN "licence_grade" text;--> statement-breakpoint
ALTER TABLE "riders" ADD COLUMN "medical_expires" date;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "expected_kmh" numeric;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "licence_upgrade" text;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "override_id" integer;--> statement-breakpoint
ALTER TABLE "briefing_sign_ons" ADD CONSTRAINT "briefing_sign_ons_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_sign_ons" ADD CONSTRAINT "briefing_sign_ons_rider_id_riders_id_fk" FOREIGN KEY ("rider_id") REFERENCES "public"."riders"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_sign_ons" ADD CONSTRAINT "briefing_sign_ons_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_sign_ons" ADD CONSTRAINT "briefing_sign_ons_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_attempt_id_attempts_id_fk" FOREIGN KEY ("attempt_id") REFERENCES "public"."attempts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_lodged_by_users_id_fk" FOREIGN KEY ("lodged_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protests" ADD CONSTRAINT "protests_decision_signature_id_signatures_id_fk" FOREIGN KEY ("decision_signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "start_overrides" ADD CONSTRAINT "start_overrides_event_id_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."events"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "start_overrides" ADD CONSTRAINT "start_overrides_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "start_overrides" ADD CONSTRAINT "start_overrides_signature_id_signatures_id_fk" FOREIGN KEY ("signature_id") REFERENCES "public"."signatures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "start_overrides" ADD CONSTRAINT "start_overrides_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "briefing_sign_on_rider" ON "briefing_sign_ons" USING btree ("briefing_id","rider_id") WHERE rider_id is not null;--> statement-breakpoint
CREATE UNIQUE INDEX "briefing_sign_on_user" ON "briefing_sign_ons" USING btree ("briefing_id","user_id") WHERE rider_id is null;