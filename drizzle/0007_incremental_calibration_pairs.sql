-- Calibration pairs, refreshed per project: the materialized view of 0004 becomes a table with the
-- same columns (plus the data version that last wrote each row), filled by
-- refresh_calibration_pairs(changed), which deletes and re-inserts only the rows of the projects in
-- `changed` (NULL = every project). Each call bumps calibration_state.version once and records in
-- calibration_changes which projects changed at that version (NULL = all), so the API can rebuild
-- its in-memory columns from the previous version's by reading only those projects.
DROP FUNCTION refresh_calibration_pairs();
--> statement-breakpoint
DROP MATERIALIZED VIEW "calibration_pairs";
--> statement-breakpoint
-- What a pair is (unchanged from 0004): one row per brace and assumed phase (sd, dd, cd) with the
-- assumed snapshot (the latest revision of that phase) and the final (governing) snapshot side by
-- side, plus the project attributes the calibration filters need. Only confirmed snapshots count,
-- and draft projects never count. A full refresh copies this view.
CREATE VIEW "calibration_pairs_source" AS
WITH assumed AS (
  SELECT DISTINCT ON (s.brace_id, s.phase) s.*
  FROM brace_snapshots s
  WHERE s.phase IN ('sd', 'dd', 'cd')
  ORDER BY s.brace_id, s.phase, s.revision DESC
)
SELECT
  b.id AS brace_id,
  a.phase::text AS phase,
  p.id AS project_id,
  p.code AS project_code,
  p.name AS project_name,
  f.frame_line,
  l.name AS level_name,
  l.level_index,
  f.configuration::text AS configuration,
  sup.code AS supplier_code,
  p.office,
  p.building_use,
  p.sdc,
  p.aisc341_edition,
  p.stories,
  p.year_designed,
  p.year_completed,
  a.core_area_in2 AS a_core_area_in2,
  a.fysc_ksi AS a_fysc_ksi,
  a.fysc_basis::text AS a_fysc_basis,
  a.fysc_max_ksi AS a_fysc_max_ksi,
  a.ry AS a_ry,
  a.beta AS a_beta,
  a.omega AS a_omega,
  a.factor_drift_multiple AS a_factor_drift_multiple,
  a.stiffness_factor AS a_stiffness_factor,
  a.adjusted_tension_kip AS a_tmax_kip,
  a.adjusted_compression_kip AS a_cmax_kip,
  g.phase::text AS final_phase,
  g.core_area_in2 AS f_core_area_in2,
  g.fysc_ksi AS f_fysc_ksi,
  g.fysc_basis::text AS f_fysc_basis,
  g.fysc_max_ksi AS f_fysc_max_ksi,
  g.ry AS f_ry,
  g.beta AS f_beta,
  g.omega AS f_omega,
  g.factor_drift_multiple AS f_factor_drift_multiple,
  g.stiffness_factor AS f_stiffness_factor,
  g.adjusted_tension_kip AS f_tmax_kip,
  g.adjusted_compression_kip AS f_cmax_kip
FROM assumed a
JOIN brace_snapshots g ON g.brace_id = a.brace_id AND g.governing AND g.confirmed AND g.id <> a.id
JOIN braces b ON b.id = a.brace_id
JOIN levels l ON l.id = b.level_id
JOIN frames f ON f.id = l.frame_id
JOIN projects p ON p.id = f.project_id
LEFT JOIN suppliers sup ON sup.id = p.supplier_id
WHERE a.confirmed AND NOT p.draft;
--> statement-breakpoint
-- The same rows for a few projects only, filtered from the projects down (an index walk per brace
-- through frames, levels, braces and brace_snapshots_key), never a DISTINCT ON over all snapshots.
CREATE FUNCTION calibration_pairs_of(ids integer[]) RETURNS SETOF calibration_pairs_source LANGUAGE sql STABLE AS $$
SELECT
  b.id, a.phase::text, p.id, p.code, p.name, f.frame_line, l.name, l.level_index, f.configuration::text, sup.code,
  p.office, p.building_use, p.sdc, p.aisc341_edition, p.stories, p.year_designed, p.year_completed,
  a.core_area_in2, a.fysc_ksi, a.fysc_basis::text, a.fysc_max_ksi, a.ry, a.beta, a.omega, a.factor_drift_multiple, a.stiffness_factor,
  a.adjusted_tension_kip, a.adjusted_compression_kip,
  g.phase::text, g.core_area_in2, g.fysc_ksi, g.fysc_basis::text, g.fysc_max_ksi, g.ry, g.beta, g.omega, g.factor_drift_multiple, g.stiffness_factor,
  g.adjusted_tension_kip, g.adjusted_compression_kip
FROM projects p
JOIN frames f ON f.project_id = p.id
JOIN levels l ON l.frame_id = f.id
JOIN braces b ON b.level_id = l.id
CROSS JOIN LATERAL (
  SELECT DISTINCT ON (s.phase) s.*
  FROM brace_snapshots s
  WHERE s.brace_id = b.id AND s.phase IN ('sd', 'dd', 'cd')
  ORDER BY s.phase, s.revision DESC
) a
JOIN brace_snapshots g ON g.brace_id = b.id AND g.governing AND g.confirmed AND g.id <> a.id
LEFT JOIN suppliers sup ON sup.id = p.supplier_id
WHERE p.id = ANY(ids) AND a.confirmed AND NOT p.draft
$$;
--> statement-breakpoint
CREATE TABLE "calibration_pairs" AS SELECT s.*, 0::bigint AS "version" FROM calibration_pairs_source s WITH NO DATA;
--> statement-breakpoint
ALTER TABLE "calibration_pairs" ADD CONSTRAINT "calibration_pairs_key" PRIMARY KEY ("brace_id", "phase");
--> statement-breakpoint
CREATE INDEX "calibration_pairs_phase_idx" ON "calibration_pairs" ("phase", "project_id");
--> statement-breakpoint
CREATE INDEX "calibration_pairs_project_idx" ON "calibration_pairs" ("project_id");
--> statement-breakpoint
-- Which projects changed at which data version (project_ids NULL: everything may have changed).
-- One row per version; old rows are pruned, and a reader that finds a version missing reloads in full.
CREATE TABLE "calibration_changes" (
  "version" bigint PRIMARY KEY,
  "project_ids" integer[],
  "changed_at" timestamp with time zone NOT NULL DEFAULT now()
);
--> statement-breakpoint
CREATE FUNCTION refresh_calibration_pairs(changed integer[] DEFAULT NULL) RETURNS bigint LANGUAGE plpgsql AS $$
DECLARE v bigint;
BEGIN
  -- The version row's lock makes refreshes run one at a time (two refreshes of one project would
  -- otherwise both insert its rows); each later statement sees what the previous refresh committed.
  UPDATE calibration_state SET version = version + 1, refreshed_at = now() WHERE id = 1 RETURNING version INTO v;
  IF changed IS NULL THEN
    DELETE FROM calibration_pairs;
    INSERT INTO calibration_pairs SELECT s.*, v FROM calibration_pairs_source s;
  ELSE
    changed := ARRAY(SELECT DISTINCT x FROM unnest(changed) x WHERE x IS NOT NULL ORDER BY x);
    DELETE FROM calibration_pairs WHERE project_id = ANY(changed);
    INSERT INTO calibration_pairs SELECT s.*, v FROM calibration_pairs_of(changed) s;
  END IF;
  INSERT INTO calibration_changes (version, project_ids) VALUES (v, changed);
  DELETE FROM calibration_changes WHERE version <= v - 1000;
  RETURN v;
END $$;
--> statement-breakpoint
SELECT refresh_calibration_pairs();
