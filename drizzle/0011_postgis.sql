-- Hand-written (drizzle-kit generate --custom): PostGIS for the job board, and the immutable
-- functions the job's generated columns in the next migration are computed with.
CREATE EXTENSION IF NOT EXISTS postgis;
--> statement-breakpoint

-- The centre of a point's 1 km privacy cell, latitude: the same arithmetic, in float8, as
-- snapToGrid in src/lib/geo.ts (rows of 1/111.32 degree counted from the South Pole).
-- tests/integration/board.test.ts compares the two on random points.
CREATE FUNCTION tapline_cell_lat(lat double precision) RETURNS double precision
LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $$
	SELECT least(
		-90::float8 + (least(floor((lat + 90::float8) / (1::float8 / 111.32::float8)),
			ceil(180::float8 / (1::float8 / 111.32::float8)) - 1::float8) + 0.5::float8)
			* (1::float8 / 111.32::float8),
		90::float8)
$$;
--> statement-breakpoint

-- The centre of a point's 1 km privacy cell, longitude: snapToGrid's columns, whose width is the
-- row's latitude step widened by 1 / cos(row centre), rounded so whole cells go round the parallel.
CREATE FUNCTION tapline_cell_lng(lat double precision, lng double precision) RETURNS double precision
LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $$
	WITH step AS (
		SELECT 360::float8 / greatest(1::float8, floor(360::float8 /
			((1::float8 / 111.32::float8) / cos(tapline_cell_lat(lat) * (pi() / 180::float8))))) AS lng_step,
			greatest(1::float8, floor(360::float8 /
			((1::float8 / 111.32::float8) / cos(tapline_cell_lat(lat) * (pi() / 180::float8))))) AS columns
	), wrapped AS (
		-- normaliseLongitude: ((x % 360) + 360) % 360 - 180 with x = lng + 180, for lng in [-180, 180]
		SELECT (((lng + 180::float8) - 360::float8 * floor((lng + 180::float8) / 360::float8)) + 360::float8) AS u
	)
	SELECT -180::float8 + (least(floor(((u - 360::float8 * floor(u / 360::float8)) - 180::float8 + 180::float8) / lng_step),
		columns - 1::float8) + 0.5::float8) * lng_step
	FROM step, wrapped
$$;
--> statement-breakpoint

-- A job's earliest preferred date ('YYYY-MM-DD'), the board's "date" sort key; jobs without one
-- sort last, as '9999-12-31' (the key $lib/board used in memory).
CREATE FUNCTION tapline_earliest_date(windows jsonb) RETURNS text
LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
	SELECT coalesce(
		(SELECT min(w.value ->> 'date') FROM jsonb_array_elements(
			CASE WHEN jsonb_typeof(windows) = 'array' THEN windows ELSE '[]'::jsonb END) AS w(value)),
		'9999-12-31')
$$;
