import type { BraceConfiguration } from '@shared/engineering/geometry'
import { DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO } from '@shared/engineering/weight'
import {
  CUTOFF_DATE, CUTOFF_YEAR, NAME_WORDS, OFFICE_PREFIX, OFFICE_SITES, SUPPLIERS, USES,
  editionsFor, firmAssumption, type BuildingUse, type FirmAssumption, type Office, type SupplierProfile,
} from './catalog'
import { addDays, daysBetween } from './dates'
import { computeElf } from './elf'
import { planFaults, plantFaults } from './faults'
import { addFinals, designLine, type FinalPlan, type LineDesign } from './frames'
import { Random, roundTo, roundToStep } from './random'
import { IMPORTANCE_FACTOR, drawSpectrum, maxHeightFt, riskCategoryFor, seismicDesignCategory, systemRowFor, type RiskCategory } from './site'
import { COLUMNS, type DemoTables, type Row, type TableName } from './tables'
import { NO_STEEL, addSteel, frameSteel, type FrameSteelLb } from './tonnage'

/**
 * `generateDemoFirm(seed)`: the invented demo firm's BRB project history as in-memory tables of the
 * import format (docs/import-format.md), in US customary units. Pure and deterministic: the same
 * seed gives deep-equal tables; nothing reads the clock or the file system.
 *
 * Per project: site and code parameters → story heights and seismic weights → ELF story shears
 * (ASCE 7-16 §12.8, `elf.ts`) shared among the frame lines of each direction → braces sized with the
 * engine's `sizeFrame` from the firm's assumed factors of that era (the `sd` snapshot) → the
 * supplier's finals (`frames.ts`) → steel tonnage, preliminary and final (`tonnage.ts`). Then the
 * planted faults (`faults.ts`).
 */

/** Base projects drawn (the planted duplicate makes 150). */
export const BASE_PROJECT_COUNT = 149

const YEAR_WEIGHTS: readonly [number, number][] = [
  [2008, 6], [2009, 5], [2010, 5], [2011, 6], [2012, 7], [2013, 8], [2014, 8], [2015, 9], [2016, 9], [2017, 9],
  [2018, 9], [2019, 9], [2020, 8], [2021, 8], [2022, 9], [2023, 9], [2024, 9], [2025, 9], [2026, 2],
]

const CONFIG_WEIGHTS: readonly [BraceConfiguration, number][] = [['inverted_v', 40], ['single_diagonal', 25], ['two_story_x', 20], ['v', 15]]

interface Direction {
  configuration: BraceConfiguration
  bayWidthFt: number
  lines: string[]
  bays: number
}

/** Everything drawn for one project before sizing. */
export interface ProjectSpec {
  code: string
  name: string
  client: string
  confidential: boolean
  benchmark: boolean
  office: Office
  region: string
  use: BuildingUse
  rc: RiskCategory
  ie: number
  sdc: string
  sds: number
  sd1: number
  s1: number
  siteClass: string
  storyHeightsFt: number[]
  plateFt2: number
  asce7: string
  aisc341: string
  analysisMethod: string
  r: number
  cd: number
  omega0: number
  year: number
  sdDate: string
  yearCompleted: number | null
  phase: 'construction' | 'complete'
  assumption: FirmAssumption
  plan: FinalPlan
  directions: Direction[]
  torsion: number
  rho: number
  gravityPsf: number
  gravityFinalFactor: number
}

const pad = (n: number, width: number) => String(n).padStart(width, '0')

const within = (date: string | null): string | null => (date !== null && date <= CUTOFF_DATE ? date : null)

function drawPlan(rng: Random, supplier: SupplierProfile, year: number, stories: number, sdDate: string) {
  const late = year >= CUTOFF_YEAR
  // Every project but the planted pending one has a rev 0 submittal by the cutoff date.
  const lag = late ? rng.int(70, 95) : rng.int(150, 420)
  const rev0 = addDays(sdDate, Math.min(lag, daysBetween(sdDate, CUTOFF_DATE) - 10))
  const hasRev1 = rng.chance(0.15)
  const rev1 = hasRev1 ? addDays(rev0, rng.int(30, 75)) : null
  const approved = addDays(rev1 ?? rev0, rng.int(20, 60))
  const coupon = addDays(approved, rng.int(30, 100))
  const couponMissing = rng.chance(0.08)
  const completion = year + (stories > 10 ? rng.int(2, 3) : rng.int(1, 3))
  const plan: FinalPlan = {
    supplier,
    rev0Date: within(rev0),
    rev1Date: within(rev1),
    approvedDate: null,
    couponDate: null,
    betaOffset: rng.normal(0, supplier.betaSd),
    omegaOffset: rng.normal(0, supplier.omegaSd),
    rev1Beta: roundTo(rng.between(0, 0.03), 2),
    rev1Omega: roundTo(rng.between(0.01, 0.05), 2),
    heats: Array.from({ length: rng.int(1, 3) }, () =>
      roundTo(rng.clampedNormal(supplier.couponMean, supplier.couponSd, supplier.fyscMin + 0.3, supplier.fyscMax), 1)),
    stiffnessFactor: supplier.stiffnessFactor + rng.normal(0, 0.04),
    yieldLengthRatio: supplier.yieldLengthRatio + rng.normal(0, 0.02),
  }
  // Approved only once every submitted revision is in hand.
  if (plan.rev0Date !== null && (!hasRev1 || plan.rev1Date !== null)) plan.approvedDate = within(approved)
  let yearCompleted: number | null = null
  if (plan.approvedDate !== null && completion <= CUTOFF_YEAR && within(coupon) !== null) {
    plan.couponDate = couponMissing ? null : coupon
    const lastYear = Number((plan.couponDate ?? plan.approvedDate).slice(0, 4))
    yearCompleted = Math.max(completion, lastYear)
  }
  return { plan, yearCompleted }
}

function pickSupplier(rng: Random, office: Office, year: number): SupplierProfile {
  const prefs: Record<Office, number[]> = { North: [3, 2, 2, 2], South: [2, 3, 1, 3], Coast: [2, 2, 3, 2] }
  return rng.weighted(SUPPLIERS.map((s, i) => [s, s.firstYear <= year ? prefs[office][i]! : 0] as const))
}

function drawDirection(rng: Random, configuration: BraceConfiguration, neededBaseShearKip: number, lineNames: string[]): Direction {
  const bayWidthFt = configuration === 'single_diagonal' ? rng.pick([20, 22, 24, 25, 26, 28]) : rng.pick([24, 25, 26, 28, 30, 30, 32, 35])
  const target = configuration === 'single_diagonal' ? rng.between(120, 260) : rng.between(220, 480)
  const needed = Math.max(2, Math.ceil((neededBaseShearKip * 1.1) / target))
  let bays = rng.chance(0.25) && needed >= 4 ? 2 : 1
  let lines = Math.ceil(needed / bays)
  while (lines > 6 && bays < 3) lines = Math.ceil(needed / ++bays)
  lines = Math.min(6, Math.max(2, lines))
  return { configuration, bayWidthFt, lines: lineNames.slice(0, lines), bays }
}

function drawSpec(rng: Random, forcedYear: number | null): Omit<ProjectSpec, 'code' | 'client' | 'confidential' | 'benchmark'> & { month: number } {
  const year = forcedYear ?? rng.weighted(YEAR_WEIGHTS)
  const month = year >= CUTOFF_YEAR ? rng.int(1, 2) : rng.int(1, 12)
  const sdDate = `${year}-${pad(month, 2)}-${pad(rng.int(1, 28), 2)}`
  const office = rng.weighted<Office>([['North', 40], ['South', 30], ['Coast', 30]])
  const site = OFFICE_SITES[office]
  const region = rng.chance(0.85) ? site.region : site.otherRegion
  const use = rng.weighted(Object.entries(USES).map(([k, v]) => [k as BuildingUse, v.weight] as const))
  const useInfo = USES[use]
  const zone = rng.weighted(site.zones)
  const rc = riskCategoryFor(use, zone, rng)
  const spectrum = drawSpectrum(zone, rng)
  const sdc = seismicDesignCategory(spectrum.sds, spectrum.sd1, spectrum.s1, rc)
  const editions = editionsFor(year, rng.uniform())
  const system = systemRowFor(editions.asce7, rng)
  // Stories: weighted to the low end of the use's range, then capped by the BRBF height limit.
  const [lo, hi] = useInfo.stories
  let stories = lo + Math.floor((hi - lo + 1) * rng.uniform() ** 1.8)
  const typical = roundToStep(rng.between(useInfo.typicalStoryFt[0], useInfo.typicalStoryFt[1]), 0.5)
  const first = Math.min(18, roundToStep(typical + rng.between(1.5, 4), 0.5))
  const limit = maxHeightFt(system.row, sdc as 'C' | 'D' | 'E' | 'F')
  while (stories > 2 && first + (stories - 1) * typical > limit) stories--
  const storyHeightsFt = Array.from({ length: stories }, (_, i) => (i === 0 ? first : typical))
  const plateFt2 = roundToStep(
    use === 'parking' ? rng.between(30000, 60000) : use === 'industrial' ? rng.between(35000, 70000) : use === 'residential' ? rng.between(12000, 26000) : rng.between(10000, 40000),
    100,
  )
  const analysisMethod = stories <= 5 ? (rng.chance(0.85) ? 'elf' : 'mrsa') : stories <= 11 ? (rng.chance(0.8) ? 'mrsa' : 'elf') : rng.chance(0.75) ? 'mrsa' : 'nlrha'
  const supplier = pickSupplier(rng, office, year)
  const assumption = firmAssumption(year, office, rng.uniform())
  const { plan, yearCompleted } = drawPlan(rng, supplier, year, stories, sdDate)
  // Base shear for laying out the frames (same ELF as the sizing below).
  const elf = computeElf({ storyHeightsFt, floorWeightsKip: floorWeights(storyHeightsFt.length, plateFt2, useInfo.seismicPsf), ...spectrum, r: system.r, ie: IMPORTANCE_FACTOR[rc], tlS: 8 })
  const primary = rng.weighted(CONFIG_WEIGHTS)
  const secondary = rng.chance(0.75) ? primary : rng.weighted(CONFIG_WEIGHTS)
  const directions = [
    drawDirection(rng, primary, elf.baseShearKip, ['A', 'B', 'C', 'D', 'E', 'F']),
    drawDirection(rng, secondary, elf.baseShearKip, ['1', '2', '3', '4', '5', '6']),
  ]
  // Redundancy ρ (ASCE 7-16 §12.3.4, simplified, from memory): 1.0 in SDC C, or with ≥ 4 braced bays per direction.
  const rho = sdc === 'C' || directions.every((d) => d.lines.length * d.bays >= 4) ? 1 : 1.3
  return {
    name: '', office, region, use, rc, ie: IMPORTANCE_FACTOR[rc], sdc, ...spectrum, storyHeightsFt, plateFt2,
    asce7: editions.asce7, aisc341: editions.aisc341, analysisMethod, r: system.r, cd: system.cd, omega0: system.omega0,
    year, month, sdDate, yearCompleted, phase: yearCompleted === null ? 'construction' : 'complete', assumption, plan, directions,
    torsion: rng.between(0.05, 0.15), rho,
    gravityPsf: useInfo.gravityPsf + 0.12 * (stories - 1) + rng.normal(0, 0.4),
    gravityFinalFactor: 1 + rng.normal(0.02, 0.03),
  }
}

/** Seismic weight per floor, kip: floor plate × dead load; roof at 80 % (demo values, no source). */
function floorWeights(stories: number, plateFt2: number, psf: number): number[] {
  return Array.from({ length: stories }, (_, i) => (plateFt2 * psf * (i === stories - 1 ? 0.8 : 1)) / 1000)
}

/** All project specs, with codes, names and clients, sorted by design date. */
export function drawSpecs(rng: Random): ProjectSpec[] {
  const raw = Array.from({ length: BASE_PROJECT_COUNT }, (_, i) => drawSpec(rng, i === 0 ? 2008 : i === 1 ? CUTOFF_YEAR : null))
  const order = raw.map((s, i) => ({ s, i })).sort((a, b) => a.s.sdDate.localeCompare(b.s.sdDate) || a.i - b.i).map(({ s }) => s)
  const seq = new Map<string, number>()
  const names = new Set<string>()
  const specs = order.map((s): ProjectSpec => {
    const key = `${OFFICE_PREFIX[s.office]}-${s.year}`
    const n = (seq.get(key) ?? rng.int(0, 3)) + rng.int(1, 3)
    seq.set(key, n)
    let name = ''
    do name = `${rng.pick(NAME_WORDS)} ${rng.pick(USES[s.use].suffixes)}`
    while (names.has(name))
    names.add(name)
    const clientIndex = Math.floor(64 * rng.uniform() ** 1.6)
    // Confidentiality is set per contract (project), about 40 %.
    const confidential = rng.chance(0.4)
    const { month: _month, ...rest } = s
    void _month
    return { ...rest, code: `${key}-${pad(n, 3)}`, name, client: `Client ${pad(clientIndex + 1, 3)}`, confidential, benchmark: !confidential && rng.chance(0.88) }
  })
  return specs
}

/** One built project: its spec, lines and take-offs. */
export interface BuiltProject {
  spec: ProjectSpec
  lines: LineDesign[]
  preliminary: FrameSteelLb
  final: FrameSteelLb | null
}

export function buildProject(spec: ProjectSpec, rng: Random): BuiltProject {
  const useInfo = USES[spec.use]
  const elf = computeElf({
    storyHeightsFt: spec.storyHeightsFt, floorWeightsKip: floorWeights(spec.storyHeightsFt.length, spec.plateFt2, useInfo.seismicPsf),
    sds: spec.sds, sd1: spec.sd1, s1: spec.s1, r: spec.r, ie: spec.ie, tlS: 8,
  })
  const lines: LineDesign[] = []
  for (const dir of spec.directions) {
    const n = dir.lines.length
    dir.lines.forEach((frameLine, j) => {
      // Share of the direction's story shear: equal split × ρ × accidental-torsion amplification of
      // the lines away from the centre (ASCE 7-16 §12.8.4.2, simplified; demo values).
      const offset = n === 1 ? 0 : Math.abs((2 * j) / (n - 1) - 1)
      const share = (spec.rho * (1 + spec.torsion * offset)) / n
      const line = designLine({
        frameLine, configuration: dir.configuration, bays: dir.bays, bayWidthFt: dir.bayWidthFt,
        storyHeightsFt: spec.storyHeightsFt, storyShearsKip: elf.storyShearsKip.map((v) => roundTo(v * share, 1)),
        cd: spec.cd, ie: spec.ie, assumption: spec.assumption, sdDate: spec.sdDate,
      })
      addFinals(line, spec.plan, rng)
      lines.push(line)
    })
  }
  const gravityBeam = spec.use === 'laboratory' || spec.use === 'parking' ? 45 : 35
  let preliminary = NO_STEEL
  let final: FrameSteelLb | null = spec.plan.rev0Date === null ? null : NO_STEEL
  for (const line of lines) {
    preliminary = addSteel(preliminary, frameSteel(line, line.levels.map((l) => ({ coreAreaIn2: l.sd.coreArea, forces: { ...l.sdStrength, angleDeg: l.angleDeg } })), DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO, gravityBeam))
    if (final !== null) {
      const states = line.levels.map((l) => {
        const g = l.finals.findIndex((f) => f.governing)
        return { coreAreaIn2: l.finals[g]!.coreArea, forces: { ...l.finalStrengths[g]!, angleDeg: l.angleDeg } }
      })
      final = addSteel(final, frameSteel(line, states, spec.plan.supplier.braceWeightRatio, gravityBeam))
    }
  }
  return { spec, lines, preliminary, final }
}

const yesNo = (v: boolean) => (v ? 'yes' : 'no')
const tons = (lb: number) => roundTo(lb / 2000, 1)

const STRUCTURAL_SCOPE: Record<Office, string> = {
  North: 'All structural steel incl. lateral system; metal deck and stairs excluded',
  South: 'Framing, columns and lateral system; deck, joists and misc. metals excluded',
  Coast: 'Structural steel incl. lateral system and connections; metal deck excluded',
}

function tonnageRows(p: BuiltProject): Row<'tonnage'>[] {
  const s = p.spec
  const floorArea = s.plateFt2 * s.storyHeightsFt.length
  const gravityPrelimLb = s.gravityPsf * floorArea
  const rows: Row<'tonnage'>[] = []
  const stage = (name: 'preliminary' | 'final', steel: FrameSteelLb, gravityLb: number) => {
    const braces = tons(steel.braces)
    const beams = tons(steel.beams)
    const columns = tons(steel.columns)
    const connections = tons(steel.connections)
    const lateral = roundTo(braces + beams + columns + connections, 1)
    const add = (category: string, weight: number, scope: string) => rows.push({ project_code: s.code, stage: name, category, weight, scope })
    add('braces', braces, name === 'preliminary' ? `BRBs, ${DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO} x core-bar weight over Lwp (estimate)` : 'BRBs incl. casing and end fittings, supplier shipping weights')
    add('beams', beams, 'Braced-frame beams only')
    add('columns', columns, 'Braced-frame columns only, full height')
    add('connections', connections, 'Gussets, stiffeners and misc. plates at braced frames')
    add('lateral_total', lateral, 'Braces + braced-frame beams, columns and connections')
    add('structural_total', roundTo(lateral + tons(gravityLb), 1), STRUCTURAL_SCOPE[s.office])
  }
  stage('preliminary', p.preliminary, gravityPrelimLb)
  if (p.final !== null) stage('final', p.final, gravityPrelimLb * s.gravityFinalFactor)
  return rows
}

function projectRow(s: ProjectSpec): Row<'projects'> {
  return {
    project_code: s.code, name: s.name, client: s.client, client_confidential: yesNo(s.confidential), benchmark_permitted: yesNo(s.benchmark),
    office: s.office, region: s.region, building_use: s.use, risk_category: s.rc, importance_factor: s.ie,
    sdc: s.sdc, sds: s.sds, sd1: s.sd1, site_class: s.siteClass, stories: s.storyHeightsFt.length,
    height: roundTo(s.storyHeightsFt.reduce((a, b) => a + b, 0), 1), floor_area: s.plateFt2 * s.storyHeightsFt.length,
    asce7_edition: s.asce7, aisc341_edition: s.aisc341, analysis_method: s.analysisMethod, r: s.r, cd: s.cd, omega0: s.omega0,
    supplier_code: s.plan.supplier.code, year_designed: s.year, year_completed: s.yearCompleted, phase_reached: s.phase,
  }
}

function emptyTables(): DemoTables {
  const t = Object.fromEntries(Object.keys(COLUMNS).map((k) => [k, []])) as unknown as DemoTables
  t.adjusted_strengths = []
  t.faults = []
  return t
}

/** Add one built project's rows to the tables. */
function emit(t: DemoTables, p: BuiltProject): void {
  const code = p.spec.code
  t.projects.push(projectRow(p.spec))
  for (const line of p.lines) {
    t.frames.push({ project_code: code, frame_line: line.frameLine, configuration: line.configuration, bays: line.bays, bay_width: line.bayWidthFt })
    for (const l of line.levels) {
      const at = { project_code: code, frame_line: line.frameLine, level: l.name }
      t.levels.push({ ...at, level_index: l.index, story_height: l.storyHeightFt, story_shear: l.storyShearKip, design_drift: l.driftIn })
      t.braces.push({ ...at, brace_count: l.braceCount, angle_deg: roundTo(l.angleDeg, 2), work_point_length: roundTo(l.lwpFt, 2), required_strength: l.requiredStrengthKip, method: 'lrfd' })
      const snaps = [l.sd, ...l.finals]
      const strengths = [l.sdStrength, ...l.finalStrengths]
      snaps.forEach((s, i) => {
        t.brace_values.push({
          ...at, phase: s.phase, revision: s.revision, date: s.date, source_document: s.source,
          required_core_area: s.requiredCoreArea, core_area: s.coreArea, fysc: s.fysc, fysc_basis: s.fyscBasis, fysc_max: s.fyscMax, ry: s.ry,
          beta: s.beta, omega: s.omega, factor_drift_multiple: s.factorDriftMultiple, stiffness_factor: s.stiffnessFactor,
          yield_length_ratio: s.yieldLengthRatio, governing: s.governing ? 'yes' : null,
        })
        const st = strengths[i]!
        t.adjusted_strengths.push({
          ...at, phase: s.phase, revision: s.revision ?? 0, expected_yield_stress: st.expectedYieldKsi, ry_applied: st.ryApplied,
          adjusted_tension: st.tensionKip, adjusted_compression: st.compressionKip,
        })
      })
    }
  }
  t.tonnage.push(...tonnageRows(p))
}

/** The demo firm's history, deterministic for a seed (default 2026). */
export function generateDemoFirm(seed = 2026): DemoTables {
  const rng = new Random(seed)
  const specs = drawSpecs(rng)
  const faultPlan = planFaults(specs)
  const built = specs.map((spec) => buildProject(spec, rng))
  const t = emptyTables()
  t.about.push({ key: 'format', value: 'backsight-history' }, { key: 'version', value: '1' }, { key: 'units', value: 'us' })
  for (const s of SUPPLIERS) t.suppliers.push({ supplier_code: s.code, display_name: s.displayName, notes: s.notes })
  for (const p of built) emit(t, p)
  plantFaults(t, faultPlan, rng)
  for (const name of Object.keys(COLUMNS) as TableName[]) {
    if (name === 'about' || name === 'suppliers') continue
    const rows = t[name] as Row<'projects'>[]
    rows.sort((a, b) => (a.project_code! < b.project_code! ? -1 : a.project_code! > b.project_code! ? 1 : 0))
  }
  return t
}
