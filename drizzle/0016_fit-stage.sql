CREATE TYPE "public"."accepted_by" AS ENUM('owner', 'window', 'settlement');--> statement-breakpoint
CREATE TYPE "public"."fit_stage" AS ENUM('to_fit', 'reported', 'accepted', 'disputed', 'settled');--> statement-breakpoint
CREATE TABLE "fit_report" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"booking_id" uuid NOT NULL,
	"visit" integer DEFAULT 1 NOT NULL,
	"installer_id" text NOT NULL,
	"minutes_taken" integer NOT NULL,
	"details" jsonb NOT NULL,
	"notes" text,
	"filed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "stage" "fit_stage" DEFAULT 'to_fit' NOT NULL;--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "reported_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "confirm_by" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "accepted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "accepted_by" "accepted_by";--> statement-breakpoint
ALTER TABLE "fit_report" ADD CONSTRAINT "fit_report_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit_report" ADD CONSTRAINT "fit_report_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "fit_report_booking_visit_idx" ON "fit_report" USING btree ("booking_id","visit");--> statement-breakpoint
CREATE INDEX "fit_report_installer_idx" ON "fit_report" USING btree ("installer_id","filed_at");--> statement-breakpoint
CREATE INDEX "booking_confirm_by_idx" ON "booking" USING btree ("confirm_by") WHERE stage = 'reported';