ALTER TABLE "job" ADD COLUMN "cell_latitude" double precision GENERATED ALWAYS AS (tapline_cell_lat(latitude)) STORED;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "cell_longitude" double precision GENERATED ALWAYS AS (tapline_cell_lng(latitude, longitude)) STORED;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "required_skills" text[];--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "scope_summary" text;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "live_quotes" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "earliest_date" text GENERATED ALWAYS AS (tapline_earliest_date(preferred_windows)) STORED NOT NULL;--> statement-breakpoint
CREATE INDEX "job_open_submitted_idx" ON "job" USING btree ("submitted_at","id") WHERE status = 'collecting_quotes';--> statement-breakpoint
CREATE INDEX "job_open_earliest_date_idx" ON "job" USING btree ("earliest_date","id") WHERE status = 'collecting_quotes';--> statement-breakpoint
CREATE INDEX "job_open_live_quotes_idx" ON "job" USING btree ("live_quotes","id") WHERE status = 'collecting_quotes';