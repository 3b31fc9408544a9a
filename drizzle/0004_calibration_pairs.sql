-- Calibration pairs: one row per brace and assumed phase (sd, dd, cd) with the assumed snapshot
-- (the latest revision of that phase) and the final (governing) snapshot side by side, plus the
-- project attributes the calibration filters need. Only confirmed snapshots count (a value that
-- waits in the review queue keeps its pair out), and draft projects never count.
-- Refreshed by refresh_calibration_pairs() after every import run, review resolution and draft save;
-- calibration_state.version tells the API's in-process cache that the pairs changed.
CREATE MATERIALIZED VIEW "calibration_pairs" AS
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
WHERE a.confirmed AND NOT p.draft
WITH DATA;
--> statement-breakpoint
CREATE UNIQUE INDEX "calibration_pairs_key" ON "calibration_pairs" ("brace_id", "phase");
--> statement-breakpoint
CREATE INDEX "calibration_pairs_phase_idx" ON "calibration_pairs" ("phase", "project_id");
--> statement-breakpoint
CREATE TABLE "calibration_state" (
  "id" smallint PRIMARY KEY DEFAULT 1 CHECK ("id" = 1),
  "version" bigint NOT NULL DEFAULT 1,
  "refreshed_at" timestamp with time zone NOT NULL DEFAULT now()
);
--> statement-breakpoint
INSERT INTO "calibration_state" ("id") VALUES (1);
--> statement-breakpoint
CREATE FUNCTION refresh_calibration_pairs() RETURNS bigint LANGUAGE plpgsql AS $$
DECLARE v bigint;
BEGIN
  REFRESH MATERIALIZED VIEW calibration_pairs;
  UPDATE calibration_state SET version = version + 1, refreshed_at = now() WHERE id = 1 RETURNING version INTO v;
  RETURN v;
END $$;
