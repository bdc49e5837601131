ALTER TABLE "payment_event" ADD COLUMN "booking_id" uuid;--> statement-breakpoint
ALTER TABLE "payment_event" ADD CONSTRAINT "payment_event_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "payment_event_booking_idx" ON "payment_event" USING btree ("booking_id","created_at");