CREATE TYPE "public"."proposal_status" AS ENUM('open', 'accepted', 'declined', 'withdrawn');--> statement-breakpoint
CREATE TABLE "reschedule_proposal" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"booking_id" uuid NOT NULL,
	"proposed_by" text NOT NULL,
	"proposer_side" text NOT NULL,
	"slot_start" timestamp with time zone NOT NULL,
	"slot_end" timestamp with time zone NOT NULL,
	"note" text,
	"status" "proposal_status" DEFAULT 'open' NOT NULL,
	"answered_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "reminder_sent_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "booking" ADD COLUMN "calendar_sequence" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "reschedule_proposal" ADD CONSTRAINT "reschedule_proposal_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reschedule_proposal" ADD CONSTRAINT "reschedule_proposal_proposed_by_user_id_fk" FOREIGN KEY ("proposed_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "reschedule_proposal_open_idx" ON "reschedule_proposal" USING btree ("booking_id") WHERE status = 'open';--> statement-breakpoint
CREATE INDEX "reschedule_proposal_booking_idx" ON "reschedule_proposal" USING btree ("booking_id","created_at");--> statement-breakpoint
CREATE INDEX "booking_reminder_due_idx" ON "booking" USING btree ("slot_start") WHERE status = 'confirmed' and reminder_sent_at is null;