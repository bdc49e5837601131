ALTER TABLE "installer_profile" ADD COLUMN "gst_registered" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "quote" ADD COLUMN "gst_registered" boolean DEFAULT true NOT NULL;