-- Fuzzy search of fit notes by vehicle: trigram similarity (pg_trgm, shipped with PostgreSQL's
-- contrib modules) on the normalised make and model the app writes to fit_note.vehicle_key, so
-- "corvin astr" still finds "Corvan Aster". The GIN index serves the % and <% operators.
CREATE EXTENSION IF NOT EXISTS pg_trgm;--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "fit_note_vehicle_key_trgm_idx" ON "fit_note" USING gin ("vehicle_key" gin_trgm_ops);--> statement-breakpoint
-- A year range runs forwards; the form checks it too, this keeps any writer honest.
ALTER TABLE "fit_note" ADD CONSTRAINT "fit_note_year_range_check" CHECK ("year_from" <= "year_to");
