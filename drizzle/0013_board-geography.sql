-- Hand-written (drizzle-kit generate --custom): the job board's PostGIS columns, their GiST
-- indexes, the live-quote count kept by a trigger, and the backfill of jobs posted before 0010.
-- drizzle-kit quotes a `geography(Point,4326)` type as an identifier, so these columns live here
-- and not in schema.ts; they are generated, so no code writes them.

-- Where the installer works from.
ALTER TABLE "installer_profile" ADD COLUMN "base" geography(Point, 4326)
	GENERATED ALWAYS AS (st_setsrid(st_makepoint(longitude, latitude), 4326)::geography) STORED;
--> statement-breakpoint
CREATE INDEX "installer_profile_base_idx" ON "installer_profile" USING gist ("base");
--> statement-breakpoint

-- The job's true point: for the owner and, after a paid booking, the installer; never the board.
ALTER TABLE "job" ADD COLUMN "location" geography(Point, 4326)
	GENERATED ALWAYS AS (st_setsrid(st_makepoint(longitude, latitude), 4326)::geography) STORED;
--> statement-breakpoint
CREATE INDEX "job_location_idx" ON "job" USING gist ("location");
--> statement-breakpoint

-- The centre of the job's 1 km privacy cell: what matching, the distance shown and the map use.
ALTER TABLE "job" ADD COLUMN "approx_location" geography(Point, 4326)
	GENERATED ALWAYS AS (st_setsrid(st_makepoint(tapline_cell_lng(latitude, longitude),
		tapline_cell_lat(latitude)), 4326)::geography) STORED;
--> statement-breakpoint
CREATE INDEX "job_open_approx_location_idx" ON "job" USING gist ("approx_location")
	WHERE status = 'collecting_quotes';
--> statement-breakpoint

-- job.live_quotes follows quote.status in the quote's own transaction. A revision that leaves a
-- quote live changes nothing, so it does not touch (or lock) the job row.
CREATE FUNCTION tapline_count_live_quotes() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'UPDATE' AND OLD.job_id = NEW.job_id
		AND (OLD.status = 'live') = (NEW.status = 'live') THEN
		RETURN NULL;
	END IF;
	IF TG_OP IN ('UPDATE', 'DELETE') AND OLD.status = 'live' THEN
		UPDATE job SET live_quotes = live_quotes - 1 WHERE id = OLD.job_id;
	END IF;
	IF TG_OP IN ('INSERT', 'UPDATE') AND NEW.status = 'live' THEN
		UPDATE job SET live_quotes = live_quotes + 1 WHERE id = NEW.job_id;
	END IF;
	RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER quote_live_count AFTER INSERT OR DELETE OR UPDATE OF status, job_id ON quote
	FOR EACH ROW EXECUTE FUNCTION tapline_count_live_quotes();
--> statement-breakpoint
UPDATE job SET live_quotes = c.n
FROM (SELECT job_id, count(*)::int AS n FROM quote WHERE status = 'live' GROUP BY job_id) AS c
WHERE c.job_id = job.id;
--> statement-breakpoint

-- Jobs posted before required_skills existed: requiredSkills() of $lib/matching as it stood when
-- this migration was written (postedJobColumns writes the column from then on).
UPDATE job SET required_skills = array_remove(ARRAY[
	CASE WHEN power = 'hardwired-parking' THEN 'parking-mode' END,
	CASE WHEN cameras <> 'front' AND body_style IN ('hatchback', 'wagon', 'suv', 'people-mover')
		THEN 'tailgate-rear' END,
	CASE WHEN body_style IN ('ute', 'van') THEN 'vans-utes' END,
	CASE WHEN power = 'obd' THEN 'obd-power' END,
	CASE WHEN cameras = 'front-rear-cabin' THEN 'cabin-camera' END
]::text[], NULL)
WHERE body_style IS NOT NULL AND cameras IS NOT NULL AND power IS NOT NULL
	AND required_skills IS NULL;
