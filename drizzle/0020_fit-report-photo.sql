CREATE TABLE "fit_report_photo" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"fit_report_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"object_key" text NOT NULL,
	"thumb_key" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "fit_report_photo" ADD CONSTRAINT "fit_report_photo_fit_report_id_fit_report_id_fk" FOREIGN KEY ("fit_report_id") REFERENCES "public"."fit_report"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "fit_report_photo_report_position_idx" ON "fit_report_photo" USING btree ("fit_report_id","position");