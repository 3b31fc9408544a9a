import { adjustedStrengthsOf } from '@shared/history/snapshot'
import type {
  FrameRecord,
  ImportProblem,
  LevelRecord,
  ProjectFields,
  ProjectRecord,
  ReviewRecord,
  SnapshotRecord,
  SupplierRecord,
  TonnageRecord,
} from '@shared/history/types'
import type { TypedRow, TypedValue } from './cells'

type V = Record<string, TypedValue>
const str = (v: TypedValue) => (v === null ? null : String(v))
const num = (v: TypedValue) => (typeof v === 'number' ? v : null)
const bool = (v: TypedValue, fallback: boolean) => (typeof v === 'boolean' ? v : fallback)

/** Angle the geometry implies must agree with the recorded angle within this (common practice, no source). */
export const ANGLE_TOLERANCE_DEG = 1.0

/** Errors listed for one project; the rest are counted in one closing line. */
export const MAX_ERRORS_PER_PROJECT = 50

export interface Assembled {
  projects: ProjectRecord[]
  suppliers: SupplierRecord[]
  problems: ImportProblem[]
  /** Codes of projects that had a hard error and will not load. */
  rejected: Set<string>
}

/**
 * Groups typed rows by project code into complete project records and runs the cross-table checks.
 * A project with any hard error is rejected whole; review findings travel with the record.
 */
export function assemble(rows: TypedRow[], fileProblems: ImportProblem[]): Assembled {
  const problems: ImportProblem[] = [...fileProblems]
  const rejected = new Set<string>()
  const byCode = new Map<string, Record<string, TypedRow[]>>()
  const suppliers = new Map<string, SupplierRecord>()

  const errorCount = new Map<string, number>()
  const fail = (code: string, p: Omit<ImportProblem, 'severity' | 'projectCode'>) => {
    rejected.add(code)
    const n = (errorCount.get(code) ?? 0) + 1
    errorCount.set(code, n)
    if (n <= MAX_ERRORS_PER_PROJECT) problems.push({ severity: 'error', projectCode: code, ...p })
  }

  for (const row of rows) {
    if (row.table === 'suppliers') {
      if (row.errors.length) problems.push(...row.errors)
      else suppliers.set(String(row.values.supplier_code), { code: String(row.values.supplier_code), displayName: String(row.values.display_name), notes: str(row.values.notes ?? null) })
      continue
    }
    const code = typeof row.values.project_code === 'string' ? row.values.project_code : undefined
    if (!code) {
      problems.push(...row.errors.map(e => ({ ...e })), { severity: 'error', file: row.file, sheet: row.sheet, row: row.line, column: 'project_code', message: 'project_code is required; the row was not read.' })
      continue
    }
    for (const e of row.errors) fail(code, e)
    const group = byCode.get(code) ?? {}
    ;(group[row.table] ??= []).push(row)
    byCode.set(code, group)
  }

  const projects: ProjectRecord[] = []
  for (const [code, group] of byCode) {
    const record = buildProject(code, group, (p) => fail(code, p), problems)
    if (record && !rejected.has(code)) projects.push(record)
  }
  for (const [code, n] of errorCount) {
    if (n > MAX_ERRORS_PER_PROJECT) {
      const first = problems.find(p => p.projectCode === code && p.severity === 'error')!
      problems.push({ severity: 'error', projectCode: code, file: first.file, sheet: first.sheet, message: `Project ${code}: and ${(n - MAX_ERRORS_PER_PROJECT).toLocaleString('en-US')} more errors like those above; fix them and run the import again to see the rest.` })
    }
  }
  // A rejected project's notes would only distract from the errors that rejected it.
  const shown = problems.filter(p => !(p.severity === 'note' && p.projectCode !== undefined && rejected.has(p.projectCode)))
  return { projects, suppliers: [...suppliers.values()], problems: shown, rejected }
}

function at(row: TypedRow, column?: string, value?: TypedValue) {
  return { file: row.file, sheet: row.sheet, row: row.line, column, value: value === undefined || value === null ? undefined : String(value) }
}

function buildProject(
  code: string,
  group: Record<string, TypedRow[]>,
  fail: (p: Omit<ImportProblem, 'severity' | 'projectCode'>) => void,
  problems: ImportProblem[],
): ProjectRecord | undefined {
  const projectRows = group.projects ?? []
  const anyRow = Object.values(group).flat()[0]!
  if (projectRows.length === 0) {
    fail({ ...at(anyRow, 'project_code', code), message: `Project ${code} has rows in other tables but none in projects.` })
    return undefined
  }
  if (projectRows.length > 1) {
    fail({ ...at(projectRows[1]!, 'project_code', code), message: `Project ${code} appears ${projectRows.length} times in projects (rows ${projectRows.map(r => r.line).join(', ')}); a project must appear once.` })
    return undefined
  }
  const p = projectRows[0]!
  const reviews: ReviewRecord[] = p.reviews.map(r => ({ field: r.column ?? '', value: r.value ?? '', reason: r.message, at: { file: r.file, sheet: r.sheet, row: r.row } }))
  const fields = toFields(code, p.values)

  // Frames
  const frames = new Map<string, FrameRecord>()
  for (const r of group.frames ?? []) {
    const line = String(r.values.frame_line)
    if (frames.has(line)) fail({ ...at(r, 'frame_line', line), message: `Frame line ${line} appears twice in project ${code}.` })
    frames.set(line, { frameLine: line, configuration: r.values.configuration as FrameRecord['configuration'], bays: num(r.values.bays ?? null) ?? 1, bayWidthIn: num(r.values.bay_width)!, levels: [] })
    reviews.push(...r.reviews.map(x => ({ field: `frames.${line}.${x.column}`, value: x.value ?? '', reason: x.message, at: { file: x.file, sheet: x.sheet, row: x.row } })))
  }
  if (frames.size === 0) fail({ ...at(p), message: `Project ${code} has no frames.` })

  // Levels
  const levelOf = new Map<string, { level: LevelRecord; frame: FrameRecord; row: TypedRow }>()
  for (const r of group.levels ?? []) {
    const frame = frames.get(String(r.values.frame_line))
    if (!frame) {
      fail({ ...at(r, 'frame_line', r.values.frame_line), message: `Level ${r.values.level} refers to frame line ${r.values.frame_line}, which project ${code} does not have.` })
      continue
    }
    const key = `${frame.frameLine}/${r.values.level}`
    if (levelOf.has(key)) fail({ ...at(r, 'level', r.values.level), message: `Level ${r.values.level} appears twice in frame ${frame.frameLine}.` })
    const level: LevelRecord = {
      name: String(r.values.level),
      levelIndex: num(r.values.level_index)!,
      storyHeightIn: num(r.values.story_height)!,
      storyShearKip: num(r.values.story_shear)!,
      designDriftIn: num(r.values.design_drift ?? null),
      brace: null,
    }
    frame.levels.push(level)
    levelOf.set(key, { level, frame, row: r })
    reviews.push(...r.reviews.map(x => ({ field: `levels.${key}.${x.column}`, value: x.value ?? '', reason: x.message, at: { file: x.file, sheet: x.sheet, row: x.row } })))
  }
  for (const frame of frames.values()) {
    frame.levels.sort((a, b) => a.levelIndex - b.levelIndex)
    const idx = frame.levels.map(l => l.levelIndex)
    if (new Set(idx).size !== idx.length) fail({ file: p.file, sheet: p.sheet, row: p.line, message: `Frame ${frame.frameLine} of ${code} repeats a level_index.` })
    if (frame.levels.length === 0) fail({ file: p.file, sheet: p.sheet, row: p.line, message: `Frame ${frame.frameLine} of ${code} has no levels.` })
  }

  // Braces, with the geometry check
  for (const r of group.braces ?? []) {
    const hit = levelOf.get(`${r.values.frame_line}/${r.values.level}`)
    if (!hit) {
      fail({ ...at(r, 'level', r.values.level), message: `Braces refer to level ${r.values.level} of frame ${r.values.frame_line}, which project ${code} does not have.` })
      continue
    }
    if (hit.level.brace) fail({ ...at(r, 'level', r.values.level), message: `Level ${r.values.level} of frame ${r.values.frame_line} has two braces rows.` })
    const angle = num(r.values.angle_deg)!
    hit.level.brace = {
      braceCount: num(r.values.brace_count)!,
      angleDeg: angle,
      workPointLengthIn: num(r.values.work_point_length)!,
      requiredStrengthKip: num(r.values.required_strength)!,
      method: (r.values.method as 'lrfd' | 'asd' | null) ?? 'lrfd',
      snapshots: [],
    }
    const horizontal = hit.frame.configuration === 'single_diagonal' ? hit.frame.bayWidthIn : hit.frame.bayWidthIn / 2
    const expected = (Math.atan2(hit.level.storyHeightIn, horizontal) * 180) / Math.PI
    if (Math.abs(expected - angle) > ANGLE_TOLERANCE_DEG) {
      reviews.push({
        field: `braces.${hit.frame.frameLine}/${hit.level.name}.angle_deg`,
        value: String(angle),
        reason: `angle_deg ${angle}° disagrees with the frame geometry (bay width and story height give ${expected.toFixed(1)}°).`,
        at: { file: r.file, sheet: r.sheet, row: r.line },
      })
    }
    reviews.push(...r.reviews.map(x => ({ field: `braces.${hit.frame.frameLine}/${hit.level.name}.${x.column}`, value: x.value ?? '', reason: x.message, at: { file: x.file, sheet: x.sheet, row: x.row } })))
  }

  // Brace values by phase
  for (const r of group.brace_values ?? []) {
    const hit = levelOf.get(`${r.values.frame_line}/${r.values.level}`)
    if (!hit?.level.brace) {
      fail({ ...at(r, 'level', r.values.level), message: `Brace values refer to level ${r.values.level} of frame ${r.values.frame_line}, which has no braces row in project ${code}.` })
      continue
    }
    const snap = toSnapshot(r.values)
    const dup = hit.level.brace.snapshots.find(s => s.phase === snap.phase && s.revision === snap.revision)
    if (dup) fail({ ...at(r, 'phase', snap.phase), message: `Phase ${snap.phase} revision ${snap.revision} appears twice for level ${hit.level.name} of frame ${hit.frame.frameLine}.` })
    const ref = { frameLine: hit.frame.frameLine, level: hit.level.name, phase: snap.phase, revision: snap.revision }
    const snapReviews: ReviewRecord[] = r.reviews.map(x => ({ field: x.column ?? '', value: x.value ?? '', reason: x.message, snapshot: ref, at: { file: x.file, sheet: x.sheet, row: x.row } }))
    snapReviews.push(...crossCheckSnapshot(snap).map(x => ({ ...x, snapshot: ref, at: { file: r.file, sheet: r.sheet, row: r.line } })))
    snap.confirmed = snapReviews.length === 0
    hit.level.brace.snapshots.push(snap)
    reviews.push(...snapReviews)
  }
  for (const { level, frame, row } of levelOf.values()) {
    const governing = level.brace?.snapshots.filter(s => s.governing) ?? []
    if (governing.length > 1) fail({ ...at(row, 'governing'), message: `Level ${level.name} of frame ${frame.frameLine} has ${governing.length} governing snapshots; mark exactly one as final.` })
  }

  // Tonnage
  const tonnage: TonnageRecord[] = []
  for (const r of group.tonnage ?? []) {
    const t: TonnageRecord = { stage: r.values.stage as TonnageRecord['stage'], category: r.values.category as TonnageRecord['category'], tons: num(r.values.weight)!, scope: str(r.values.scope ?? null) }
    if (tonnage.some(x => x.stage === t.stage && x.category === t.category)) fail({ ...at(r, 'category', t.category), message: `Tonnage ${t.stage} ${t.category} appears twice for ${code}.` })
    tonnage.push(t)
  }

  if (fields.phaseReached === 'complete' && [...levelOf.values()].some(l => l.level.brace && !l.level.brace.snapshots.some(s => s.governing))) {
    problems.push({ severity: 'note', projectCode: code, file: p.file, sheet: p.sheet, row: p.line, message: `Project ${code} is complete but some braces have no final (governing) values; they are kept as pending.` })
  }
  return { fields, frames: [...frames.values()], tonnage, reviews, source: { file: p.file, sheet: p.sheet, row: p.line } }
}

function toFields(code: string, v: V): ProjectFields {
  return {
    code,
    name: String(v.name),
    client: str(v.client ?? null),
    clientConfidential: bool(v.client_confidential ?? null, true),
    benchmarkPermitted: bool(v.benchmark_permitted ?? null, false),
    office: str(v.office ?? null),
    region: str(v.region ?? null),
    buildingUse: str(v.building_use ?? null),
    riskCategory: str(v.risk_category ?? null),
    importanceFactor: num(v.importance_factor ?? null),
    sdc: str(v.sdc ?? null),
    sds: num(v.sds ?? null),
    sd1: num(v.sd1 ?? null),
    siteClass: str(v.site_class ?? null),
    stories: num(v.stories ?? null),
    heightFt: num(v.height ?? null) === null ? null : num(v.height ?? null)! / 12,
    floorAreaFt2: num(v.floor_area ?? null),
    asce7Edition: str(v.asce7_edition ?? null),
    aisc341Edition: str(v.aisc341_edition ?? null),
    analysisMethod: str(v.analysis_method ?? null),
    r: num(v.r ?? null),
    cd: num(v.cd ?? null),
    omega0: num(v.omega0 ?? null),
    supplierCode: str(v.supplier_code ?? null),
    yearDesigned: num(v.year_designed)!,
    yearCompleted: num(v.year_completed ?? null),
    phaseReached: str(v.phase_reached ?? null),
  }
}

function toSnapshot(v: V): SnapshotRecord {
  const s: SnapshotRecord = {
    phase: v.phase as SnapshotRecord['phase'],
    revision: num(v.revision ?? null) ?? 0,
    date: str(v.date ?? null),
    sourceDocument: str(v.source_document ?? null),
    requiredCoreAreaIn2: num(v.required_core_area ?? null),
    coreAreaIn2: num(v.core_area ?? null),
    fyscKsi: num(v.fysc ?? null),
    fyscBasis: (v.fysc_basis as SnapshotRecord['fyscBasis']) ?? null,
    fyscMaxKsi: num(v.fysc_max ?? null),
    ry: num(v.ry ?? null),
    beta: num(v.beta ?? null),
    omega: num(v.omega ?? null),
    factorDriftMultiple: num(v.factor_drift_multiple ?? null),
    stiffnessFactor: num(v.stiffness_factor ?? null),
    yieldLengthRatio: num(v.yield_length_ratio ?? null),
    adjustedTensionKip: null,
    adjustedCompressionKip: null,
    governing: bool(v.governing ?? null, false),
    confirmed: true,
  }
  const a = adjustedStrengthsOf(s)
  s.adjustedTensionKip = a.tensionKip
  s.adjustedCompressionKip = a.compressionKip
  return s
}

/** Cross-field checks within one snapshot (never auto-fixed). */
function crossCheckSnapshot(s: SnapshotRecord): Omit<ReviewRecord, 'snapshot'>[] {
  const out: Omit<ReviewRecord, 'snapshot'>[] = []
  if (s.beta !== null && s.omega !== null && s.beta > 1.3 && s.omega < s.beta && s.omega >= 1.0 && s.omega <= 1.3) {
    out.push({ field: 'beta', value: `β ${s.beta}, ω ${s.omega}`, reason: `β ${s.beta} and ω ${s.omega} look swapped (β above its 1.3 qualification limit while ω is below β).` })
  }
  if (s.coreAreaIn2 !== null && s.requiredCoreAreaIn2 !== null && s.coreAreaIn2 < s.requiredCoreAreaIn2 * (1 - 1e-9)) {
    out.push({ field: 'core_area', value: String(s.coreAreaIn2), reason: `The chosen core area ${s.coreAreaIn2} in² is below the required ${s.requiredCoreAreaIn2} in².` })
  }
  if ((s.fyscBasis === 'coupon' || s.fyscBasis === 'mill_cert') && s.ry !== null && s.ry !== 1) {
    out.push({ field: 'ry', value: String(s.ry), reason: `Ry ${s.ry} is given with a ${s.fyscBasis === 'coupon' ? 'coupon-tested' : 'mill certificate'} yield stress; measured values take Ry = 1.0 (AISC 341-16 F4.2a).` })
  }
  if (s.fyscBasis === 'yield_range' && s.fyscMaxKsi === null) {
    out.push({ field: 'fysc_max', value: '', reason: 'A yield-range basis needs fysc_max, the upper bound used for adjusted strengths.' })
  }
  if (s.phase !== 'sd' && s.governing && (s.beta !== null || s.omega !== null) && s.factorDriftMultiple === null) {
    out.push({ field: 'factor_drift_multiple', value: '', reason: 'Final β and ω without the deformation they were taken at cannot be compared with other projects.' })
  }
  return out
}
