import { DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO } from '@shared/engineering/weight'
import { SUPPLIERS } from './catalog'
import { DRIFT_FLEXIBILITY_ALLOWANCE } from './frames'
import type { DemoTables, FaultId } from './tables'
import type { DemoFile } from './write'

/** Titles of the planted faults, in the order of the brief (a)–(g). */
export const FAULT_TITLES: Record<FaultId, string> = {
  unit_slip: '(a) unit slip',
  mpa_in_ksi: '(b) MPa typed in a ksi column',
  duplicate_project: '(c) duplicated project',
  pending_final: '(d) final values pending',
  revised_submittal: '(e) revised submittal',
  beta_omega_swap: '(f) β and ω swapped',
  empty_story_height: '(g) hard error: empty story_height',
}

/** `demo-data/README.md`, generated with the files so the fault project codes are always right. */
export function renderReadme(t: DemoTables, files: readonly DemoFile[]): string {
  const fileOf = (code: string, table: 'levels' | 'brace_values' | 'projects') =>
    files.find((f) => (f.tables[table] as { project_code: unknown }[] | undefined)?.some((r) => r.project_code === code))?.path ?? '?'
  const faultRows = t.faults.map((f) => {
    const table = f.id === 'empty_story_height' ? 'levels' : f.id === 'duplicate_project' ? 'projects' : 'brace_values'
    const where = [f.frame_line && `frame line ${f.frame_line}`, f.level && `level ${f.level}`, f.phase && `phase ${f.phase}`, f.revision !== undefined && `rev ${f.revision}`]
      .filter(Boolean).join(', ')
    const values = f.column ? ` \`${f.column}\` = ${f.value === null ? '(empty)' : f.value} (meant ${f.intended}).` : ''
    return `| \`${f.id}\` ${FAULT_TITLES[f.id]} | \`${f.project_code}\`${f.duplicate_of ? ` (copy of \`${f.duplicate_of}\`)` : ''} | \`${fileOf(f.project_code, table)}\` ${table}${where ? `, ${where}` : ''} | ${f.description}${values} |`
  })
  const governing = t.brace_values.filter((r) => r.governing === 'yes').length
  const confidential = t.projects.filter((p) => p.client_confidential === 'yes').length
  const benchmark = t.projects.filter((p) => p.benchmark_permitted === 'yes').length
  return `# demo-data/

The project history of an **invented** structural engineering firm, as the files it would hand over
to Backsight (format: \`docs/import-format.md\`, version 1). Every name is fictitious: the offices
(North, South, Coast), regions (Region 1–3), clients (\`Client 001\`…), project names and the four
brace suppliers. Nothing here names or describes a real firm, client, supplier, city or street.

**Generated — do not edit by hand.** \`npx tsx scripts/generate-demo-firm.ts [outDir]\` (default
\`demo-data/\`) rebuilds everything from seed 2026 (\`generateDemoFirm\` in \`scripts/demo-firm/\`).
\`tests/demo-data/generator.test.ts\` fails when these files differ from what the generator makes now.

## Files

A run loads all of them together; tables merge by \`project_code\`.

| path | content |
| --- | --- |
${files.map((f) => `| \`${f.path}${f.format === 'csv' ? '/' : ''}\` | ${f.description} |`).join('\n')}

Units are US customary (\`units\` = \`us\` in every \`about\` table / sheet and in the Arrow schema
metadata): ft, in (drift), kip, ksi, in², ft², short ton. One column overrides that:
\`levels.csv\` in the CSV folder has the header \`story_shear [kN]\` and values in kN (kip × 4.4482216152605,
to 0.01 kN).

## Contents

- ${t.projects.length} projects designed 2008–2026, ${t.frames.length} frame lines, ${t.levels.length} level rows, ${t.braces.length} brace rows, ${t.brace_values.length} brace snapshots (${governing} governing), ${t.tonnage.length} tonnage rows.
- Story shears: ASCE 7-16 §12.8 equivalent lateral force (Ta = 0.03·hn^0.75, Cs, Cvx with k from T), split equally among the frame lines of a direction × ρ × an accidental-torsion amplification of the outer lines.
- Braces: sized with the engine's \`sizeFrame\` (LRFD, φ = 0.90) from the firm's assumed factors of the era — the \`sd\` snapshot: β 1.10–1.15, ω 1.30–1.40, KF 1.3–1.5, Ly/Lwp 0.6; up to 2013 Fysc = 36 ksi (A36 plate) with Ry = 1.3, from 2014 a 38–46 ksi yield range. Minimum core 2.0 in², then 0.25 / 0.5 / 1.0 in² steps.
- Design drift: drift at brace yield × Pu/Pysc × Cd / Ie × ${DRIFT_FLEXIBILITY_ALLOWANCE} (column-flexibility allowance, common practice, no source).
- Supplier finals: \`submittal\` rev 0 (about 15 % of projects also rev 1), \`approved\`, \`coupon\` (measured fysc, \`fysc_basis\` coupon, \`ry\` empty). β and ω follow each supplier's curve at the core strain of 2.0 × the design drift (\`factor_drift_multiple\` 2.0); the supplier re-sizes the core with its own plate yield and increments, so some cores are one step off the preliminary size. Exactly one snapshot per brace is \`governing\` (coupon, else approved, else the latest submittal) — except the pending project below. Projects still in construction have no coupon data.
- Tonnage (short tons): braces = ratio × 490 lb/ft³ × Asc × Lwp; the preliminary ratio is the engine default ${DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO} (placeholder), the final ratio the supplier's (below). Braced-frame beams, columns and connections are a demo estimate from the capacity-design forces (βωRyPysc, ωRyPysc), so final lateral steel moves with the final adjusted strengths; structural_total adds the gravity framing (about 6–9 psf). \`scope\` says what each row includes (the structural_total scope differs by office, as in real records).
- ${confidential} of ${t.projects.length} projects are client-confidential (\`client_confidential\` yes, \`benchmark_permitted\` no); ${benchmark} of the others may be benchmarked.

## Suppliers (invented)

| code | display name | habit | final brace-to-core weight ratio |
| --- | --- | --- | --- |
${SUPPLIERS.map((s) => `| \`${s.code}\` | ${s.displayName} | ${s.notes.replace('Invented demo supplier. ', '')} | ${s.braceWeightRatio} |`).join('\n')}

## Planted faults

Bad data a real history contains (the "bad data to expect" list of the practice reference). The loader and the analytics
are expected to catch each of these; everything else is meant to be clean.

| fault | project | where | what |
| --- | --- | --- | --- |
${faultRows.join('\n')}
`
}
