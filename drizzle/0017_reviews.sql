CREATE TYPE "public"."review_side" AS ENUM('owner', 'installer');--> statement-breakpoint
CREATE TABLE "review" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"booking_id" uuid NOT NULL,
	"side" "review_side" NOT NULL,
	"author_id" text NOT NULL,
	"subject_id" text NOT NULL,
	"aspects" jsonb NOT NULL,
	"overall_stars" double precision NOT NULL,
	"text" text NOT NULL,
	"visible_from" timestamp with time zone NOT NULL,
	"reply" text,
	"replied_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_overall_stars_range" CHECK ("review"."overall_stars" between 1 and 5)
);
--> statement-breakpoint
ALTER TABLE "review" ADD CONSTRAINT "review_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review" ADD CONSTRAINT "review_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review" ADD CONSTRAINT "review_subject_id_user_id_fk" FOREIGN KEY ("subject_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "review_booking_side_idx" ON "review" USING btree ("booking_id","side");--> statement-breakpoint
CREATE INDEX "review_subject_idx" ON "review" USING btree ("subject_id","side","created_at");