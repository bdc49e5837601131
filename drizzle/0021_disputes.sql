CREATE TYPE "public"."dispute_event_kind" AS ENUM('opened', 'owner_evidence', 'installer_response', 'admin_note', 'settlement');--> statement-breakpoint
CREATE TYPE "public"."dispute_outcome" AS ENUM('release', 'partial_refund', 'full_refund', 'return_visit');--> statement-breakpoint
CREATE TYPE "public"."dispute_status" AS ENUM('open', 'settled');--> statement-breakpoint
CREATE TABLE "dispute" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"booking_id" uuid NOT NULL,
	"opened_by" text NOT NULL,
	"reason" text NOT NULL,
	"description" text NOT NULL,
	"status" "dispute_status" DEFAULT 'open' NOT NULL,
	"held_cents" integer NOT NULL,
	"opened_at" timestamp with time zone DEFAULT now() NOT NULL,
	"outcome" "dispute_outcome",
	"refund_cents" integer,
	"payout_cents" integer,
	"fee_cents" integer,
	"gst_on_fee_cents" integer,
	"return_visit_start" timestamp with time zone,
	"return_visit_end" timestamp with time zone,
	"settled_by" text,
	"settled_at" timestamp with time zone,
	"settlement_note" text
);
--> statement-breakpoint
CREATE TABLE "dispute_event" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"dispute_id" uuid NOT NULL,
	"kind" "dispute_event_kind" NOT NULL,
	"author_id" text NOT NULL,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "dispute_photo" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"dispute_id" uuid NOT NULL,
	"event_id" uuid NOT NULL,
	"uploaded_by" text NOT NULL,
	"object_key" text NOT NULL,
	"thumb_key" text NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "dispute" ADD CONSTRAINT "dispute_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute" ADD CONSTRAINT "dispute_opened_by_user_id_fk" FOREIGN KEY ("opened_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute" ADD CONSTRAINT "dispute_settled_by_user_id_fk" FOREIGN KEY ("settled_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_event" ADD CONSTRAINT "dispute_event_dispute_id_dispute_id_fk" FOREIGN KEY ("dispute_id") REFERENCES "public"."dispute"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_event" ADD CONSTRAINT "dispute_event_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_photo" ADD CONSTRAINT "dispute_photo_dispute_id_dispute_id_fk" FOREIGN KEY ("dispute_id") REFERENCES "public"."dispute"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_photo" ADD CONSTRAINT "dispute_photo_event_id_dispute_event_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."dispute_event"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_photo" ADD CONSTRAINT "dispute_photo_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "dispute_open_booking_idx" ON "dispute" USING btree ("booking_id") WHERE status = 'open';--> statement-breakpoint
CREATE INDEX "dispute_booking_idx" ON "dispute" USING btree ("booking_id","opened_at");--> statement-breakpoint
CREATE INDEX "dispute_status_opened_idx" ON "dispute" USING btree ("status","opened_at");--> statement-breakpoint
CREATE INDEX "dispute_settled_idx" ON "dispute" USING btree ("settled_at");--> statement-breakpoint
CREATE INDEX "dispute_event_dispute_idx" ON "dispute_event" USING btree ("dispute_id","created_at");--> statement-breakpoint
CREATE INDEX "dispute_photo_event_idx" ON "dispute_photo" USING btree ("event_id");