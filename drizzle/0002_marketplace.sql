CREATE TYPE "public"."booking_status" AS ENUM('awaiting_payment', 'confirmed', 'cancelled', 'lapsed');--> statement-breakpoint
CREATE TYPE "public"."quote_status" AS ENUM('live', 'accepted', 'declined', 'withdrawn', 'lapsed');--> statement-breakpoint
CREATE TABLE "booking" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"quote_id" uuid NOT NULL,
	"installer_id" text NOT NULL,
	"owner_id" text NOT NULL,
	"slot_start" timestamp with time zone NOT NULL,
	"slot_end" timestamp with time zone NOT NULL,
	"status" "booking_status" DEFAULT 'awaiting_payment' NOT NULL,
	"hold_expires_at" timestamp with time zone NOT NULL,
	"total_cents" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_message" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"installer_id" text NOT NULL,
	"author_id" text NOT NULL,
	"body" text NOT NULL,
	"masked" text[] DEFAULT '{}' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_notice" (
	"installer_id" text NOT NULL,
	"job_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "job_notice_installer_id_job_id_pk" PRIMARY KEY("installer_id","job_id")
);
--> statement-breakpoint
CREATE TABLE "quote_revision" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"quote_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"snapshot" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "quotes_notified_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "status" "quote_status" DEFAULT 'live' NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "revision" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "lines" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "labour_cents" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "parts_cents" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "travel_cents" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "gst_cents" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "warranty_months" smallint DEFAULT 12 NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "camera_supplied" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "slots" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "message" text;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "distance_km" double precision;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "expires_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "updated_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_quote_id_quote_id_fk" FOREIGN KEY ("quote_id") REFERENCES "public"."quote"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_message" ADD CONSTRAINT "job_message_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_message" ADD CONSTRAINT "job_message_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_message" ADD CONSTRAINT "job_message_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_notice" ADD CONSTRAINT "job_notice_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_notice" ADD CONSTRAINT "job_notice_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_revision" ADD CONSTRAINT "quote_revision_quote_id_quote_id_fk" FOREIGN KEY ("quote_id") REFERENCES "public"."quote"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "booking_live_job_idx" ON "booking" USING btree ("job_id") WHERE status in ('awaiting_payment', 'confirmed');--> statement-breakpoint
CREATE INDEX "booking_installer_idx" ON "booking" USING btree ("installer_id","slot_start");--> statement-breakpoint
CREATE INDEX "job_message_thread_idx" ON "job_message" USING btree ("job_id","installer_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_revision_quote_rev_idx" ON "quote_revision" USING btree ("quote_id","revision");--> statement-breakpoint
CREATE INDEX "quote_installer_idx" ON "quote" USING btree ("installer_id");--> statement-breakpoint
CREATE EXTENSION IF NOT EXISTS btree_gist;
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_installer_no_overlap"
	EXCLUDE USING gist ("installer_id" WITH =, tstzrange("slot_start", "slot_end") WITH &&)
	WHERE (status in ('awaiting_payment', 'confirmed'));
--> statement-breakpoint
ALTER TABLE "booking" ADD CONSTRAINT "booking_slot_order" CHECK ("slot_end" > "slot_start");
