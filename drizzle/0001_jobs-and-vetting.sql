CREATE TYPE "public"."job_status" AS ENUM('drafting', 'collecting_quotes', 'booked', 'fitted', 'settled', 'withdrawn');--> statement-breakpoint
CREATE TABLE "installer_blocked_date" (
	"installer_id" text NOT NULL,
	"day" date NOT NULL,
	"note" text,
	CONSTRAINT "installer_blocked_date_installer_id_day_pk" PRIMARY KEY("installer_id","day")
);
--> statement-breakpoint
CREATE TABLE "installer_document" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"installer_id" text NOT NULL,
	"kind" text NOT NULL,
	"object_key" text NOT NULL,
	"thumb_key" text,
	"content_type" text NOT NULL,
	"bytes" integer NOT NULL,
	"original_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "installer_hours" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"installer_id" text NOT NULL,
	"weekday" smallint NOT NULL,
	"start_minute" smallint NOT NULL,
	"end_minute" smallint NOT NULL
);
--> statement-breakpoint
CREATE TABLE "insurance_reminder" (
	"installer_id" text NOT NULL,
	"expires_on" date NOT NULL,
	"days_before" smallint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "insurance_reminder_installer_id_expires_on_days_before_pk" PRIMARY KEY("installer_id","expires_on","days_before")
);
--> statement-breakpoint
CREATE TABLE "job" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"owner_id" text NOT NULL,
	"status" "job_status" DEFAULT 'drafting' NOT NULL,
	"draft_step" text DEFAULT 'vehicle' NOT NULL,
	"draft" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"request" jsonb,
	"scope" jsonb,
	"title" text,
	"body_style" text,
	"cameras" text,
	"power" text,
	"location_mode" text,
	"suburb" text,
	"postcode" varchar(4),
	"latitude" double precision,
	"longitude" double precision,
	"address_line" text,
	"time_zone" text DEFAULT 'Australia/Adelaide' NOT NULL,
	"preferred_windows" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"price_low_cents" integer,
	"price_high_cents" integer,
	"withdrawn_reason" text,
	"withdrawn_at" timestamp with time zone,
	"submitted_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_photo" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"object_key" text NOT NULL,
	"thumb_key" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "quote" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"installer_id" text NOT NULL,
	"total_cents" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "vetting_event" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"installer_id" text NOT NULL,
	"actor_id" text,
	"action" text NOT NULL,
	"from_status" "vetting_status",
	"to_status" "vetting_status",
	"reason" text,
	"checklist" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "contact_name" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "phone" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "abn" varchar(11);--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "years_in_trade" smallint;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "skills" text[] DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "workshop_address" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "travel_fee_cents_per_km" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "free_radius_km" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "time_zone" text DEFAULT 'Australia/Adelaide' NOT NULL;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "insurer" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "policy_number" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "cover_cents" bigint;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "insurance_expires_on" date;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "paused_reason" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "submitted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "updated_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "installer_blocked_date" ADD CONSTRAINT "installer_blocked_date_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "installer_document" ADD CONSTRAINT "installer_document_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "installer_hours" ADD CONSTRAINT "installer_hours_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "insurance_reminder" ADD CONSTRAINT "insurance_reminder_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_photo" ADD CONSTRAINT "job_photo_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote" ADD CONSTRAINT "quote_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote" ADD CONSTRAINT "quote_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vetting_event" ADD CONSTRAINT "vetting_event_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vetting_event" ADD CONSTRAINT "vetting_event_actor_id_user_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "installer_document_installer_idx" ON "installer_document" USING btree ("installer_id");--> statement-breakpoint
CREATE INDEX "installer_hours_installer_idx" ON "installer_hours" USING btree ("installer_id");--> statement-breakpoint
CREATE INDEX "job_owner_idx" ON "job" USING btree ("owner_id","created_at");--> statement-breakpoint
CREATE INDEX "job_status_lat_lng_idx" ON "job" USING btree ("status","latitude","longitude");--> statement-breakpoint
CREATE UNIQUE INDEX "job_photo_job_kind_idx" ON "job_photo" USING btree ("job_id","kind");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_job_installer_idx" ON "quote" USING btree ("job_id","installer_id");--> statement-breakpoint
CREATE INDEX "vetting_event_installer_idx" ON "vetting_event" USING btree ("installer_id","created_at");--> statement-breakpoint
CREATE INDEX "installer_profile_status_idx" ON "installer_profile" USING btree ("vetting_status");--> statement-breakpoint
CREATE FUNCTION "vetting_event_is_append_only"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'vetting_event is an audit trail: rows cannot be changed or deleted';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER "vetting_event_no_update" BEFORE UPDATE OR DELETE ON "vetting_event"
	FOR EACH ROW EXECUTE FUNCTION "vetting_event_is_append_only"();
--> statement-breakpoint
CREATE TRIGGER "vetting_event_no_truncate" BEFORE TRUNCATE ON "vetting_event"
	FOR EACH STATEMENT EXECUTE FUNCTION "vetting_event_is_append_only"();
