CREATE TABLE "fit_note" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"booking_id" uuid NOT NULL,
	"author_id" text NOT NULL,
	"make" text NOT NULL,
	"model" text NOT NULL,
	"vehicle_key" text NOT NULL,
	"year_from" smallint NOT NULL,
	"year_to" smallint NOT NULL,
	"body_style" text NOT NULL,
	"fuse_box_location" text NOT NULL,
	"fuse_box_access" text NOT NULL,
	"switched_fuse" text NOT NULL,
	"switched_rating_amps" smallint NOT NULL,
	"permanent_fuse" text,
	"permanent_rating_amps" smallint,
	"fuse_family" text NOT NULL,
	"ground_points" text NOT NULL,
	"trim_removal" text NOT NULL,
	"grommet_route" text,
	"pitfalls" text,
	"minutes_taken" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "fit_note_booking_id_unique" UNIQUE("booking_id")
);
--> statement-breakpoint
CREATE TABLE "fit_note_mark" (
	"note_id" uuid NOT NULL,
	"installer_id" text NOT NULL,
	"verdict" text NOT NULL,
	"comment" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "fit_note_mark_note_id_installer_id_pk" PRIMARY KEY("note_id","installer_id")
);
--> statement-breakpoint
CREATE TABLE "fit_note_photo" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"note_id" uuid NOT NULL,
	"object_key" text NOT NULL,
	"thumb_key" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "fit_note" ADD CONSTRAINT "fit_note_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit_note" ADD CONSTRAINT "fit_note_author_id_installer_profile_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit_note_mark" ADD CONSTRAINT "fit_note_mark_note_id_fit_note_id_fk" FOREIGN KEY ("note_id") REFERENCES "public"."fit_note"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit_note_mark" ADD CONSTRAINT "fit_note_mark_installer_id_installer_profile_user_id_fk" FOREIGN KEY ("installer_id") REFERENCES "public"."installer_profile"("user_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit_note_photo" ADD CONSTRAINT "fit_note_photo_note_id_fit_note_id_fk" FOREIGN KEY ("note_id") REFERENCES "public"."fit_note"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "fit_note_body_year_idx" ON "fit_note" USING btree ("body_style","year_from","year_to");--> statement-breakpoint
CREATE INDEX "fit_note_created_idx" ON "fit_note" USING btree ("created_at","id");--> statement-breakpoint
CREATE INDEX "fit_note_photo_note_idx" ON "fit_note_photo" USING btree ("note_id");