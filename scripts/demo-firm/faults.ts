import { ksiToMpa } from '@shared/units/stress'
import { CUTOFF_YEAR } from './catalog'
import { addDays } from './dates'
import type { ProjectSpec } from './firm'
import type { Random } from './random'
import type { DemoTables, PlantedFault, Row } from './tables'

/**
 * The planted data faults of the demo firm (practice reference §(d), "bad data to expect").
 * Projects are chosen by fixed rules on the drawn specs, so the choice is deterministic, and the
 * few spec values a fault needs (the heat whose coupon value gets mistyped) are set before sizing,
 * so every other table stays consistent with what the firm meant.
 */

/** Which project carries which fault. */
export interface FaultPlan {
  unitSlip: ProjectSpec
  mpaInKsi: ProjectSpec
  duplicateOf: ProjectSpec
  pending: ProjectSpec
  revised: ProjectSpec
  swap: ProjectSpec
  emptyHeight: ProjectSpec
}

const hasCoupon = (s: ProjectSpec) => s.phase === 'complete' && s.plan.couponDate !== null && s.plan.supplier.fyscMin === 38
const inYears = (s: ProjectSpec, a: number, b: number) => s.year >= a && s.year <= b

function first(specs: readonly ProjectSpec[], what: string, test: (s: ProjectSpec) => boolean): ProjectSpec {
  const found = specs.find(test)
  if (!found) throw new Error(`demo firm: no project fits the ${what} fault; change the rule or the seed.`)
  return found
}

/** Choose the fault projects and set the spec values the faults need; specs are sorted by design date. */
export function planFaults(specs: ProjectSpec[]): FaultPlan {
  // (d) pending: the 2026 project designed last has no submittal yet (phase construction).
  const pending = first([...specs].reverse(), 'pending', (s) => s.year === CUTOFF_YEAR)
  pending.plan = { ...pending.plan, rev0Date: null, rev1Date: null, approvedDate: null, couponDate: null }
  pending.phase = 'construction'
  pending.yearCompleted = null
  // (e) revised: a 2025 project designed in the first half year has rev 0 and rev 1 and no approval yet.
  const revised = first(specs, 'revised', (s) => s.year === 2025 && s.sdDate < '2025-07-01' && s.phase === 'construction')
  const rev0 = addDays(revised.sdDate, 240)
  revised.plan = { ...revised.plan, rev0Date: rev0, rev1Date: addDays(rev0, 45), approvedDate: null, couponDate: null }
  // (a) unit slip: a North 2009–2011 project; its first heat is 38.0 ksi, typed 3.8 on one coupon row.
  const unitSlip = first(specs, 'unit slip', (s) => s.office === 'North' && inYears(s, 2009, 2011) && hasCoupon(s))
  unitSlip.plan = { ...unitSlip.plan, heats: [38, ...unitSlip.plan.heats.slice(1)] }
  // (b) MPa in a ksi column: a South 2012–2019 project; first heat 42.1 ksi, typed as 290 (MPa) on one coupon row.
  const mpaInKsi = first(specs, 'MPa in ksi', (s) => s.office === 'South' && inYears(s, 2012, 2019) && hasCoupon(s))
  mpaInKsi.plan = { ...mpaInKsi.plan, heats: [42.1, ...mpaInKsi.plan.heats.slice(1)] }
  // (c) duplicate: a complete North 2012–2015 project of 3+ stories, copied under a new code.
  const duplicateOf = first(specs, 'duplicate', (s) => s.office === 'North' && inYears(s, 2012, 2015) && s.phase === 'complete' && s.storyHeightsFt.length >= 3)
  // (f) β/ω swap: the sd snapshot of one story of a Coast 2020–2023 project assuming β 1.1, ω 1.4.
  const swap = first(specs, 'beta/omega swap', (s) => s.office === 'Coast' && inYears(s, 2020, 2023) && s.phase === 'complete')
  swap.assumption = { ...swap.assumption, beta: 1.1, omega: 1.4 }
  // (g) hard error: a South 2020–2023 project of 3+ stories with one empty story_height.
  const emptyHeight = first(specs, 'empty story height', (s) => s.office === 'South' && inYears(s, 2020, 2023) && s.storyHeightsFt.length >= 3)
  return { unitSlip, mpaInKsi, duplicateOf, pending, revised, swap, emptyHeight }
}

const PROJECT_TABLES = ['frames', 'levels', 'braces', 'brace_values', 'tonnage', 'adjusted_strengths'] as const

/** Plant the faults in the built tables (before sorting) and record them in `t.faults`. */
export function plantFaults(t: DemoTables, plan: FaultPlan, rng: Random): void {
  const faults: PlantedFault[] = []
  const firstLine = (code: string) => t.frames.find((f) => f.project_code === code)!.frame_line as string

  // (a) and (b): one coupon row on heat 1 of the first frame line's bottom story.
  const typo = (spec: ProjectSpec, id: 'unit_slip' | 'mpa_in_ksi', typed: (v: number) => number, description: string) => {
    const line = firstLine(spec.code)
    const row = t.brace_values.find((r) => r.project_code === spec.code && r.frame_line === line && r.phase === 'coupon' && r.fysc === spec.plan.heats[0])!
    const intended = row.fysc as number
    row.fysc = typed(intended)
    faults.push({ id, project_code: spec.code, frame_line: line, level: row.level as string, phase: 'coupon', column: 'fysc', value: row.fysc, intended, description })
  }
  typo(plan.unitSlip, 'unit_slip', (v) => Math.round(v) / 10, 'Coupon fysc typed 3.8 where 38.0 ksi was meant (decimal slip).')
  typo(plan.mpaInKsi, 'mpa_in_ksi', (v) => Math.round(ksiToMpa(v)), 'Coupon fysc typed in MPa (290) in a ksi column; 42.1 ksi was meant.')

  // (c) duplicate: every row of the original again under a new code of the same office and year.
  const orig = plan.duplicateOf.code
  const prefix = orig.slice(0, orig.lastIndexOf('-'))
  const taken = t.projects.filter((p) => String(p.project_code).startsWith(prefix)).map((p) => Number(String(p.project_code).slice(prefix.length + 1)))
  const copy = `${prefix}-${String(Math.max(...taken) + rng.int(2, 5)).padStart(3, '0')}`
  t.projects.push({ ...t.projects.find((p) => p.project_code === orig)!, project_code: copy })
  for (const table of PROJECT_TABLES) {
    const rows = t[table] as { project_code: unknown }[]
    rows.push(...rows.filter((r) => r.project_code === orig).map((r) => ({ ...r, project_code: copy })))
  }
  faults.push({ id: 'duplicate_project', project_code: copy, duplicate_of: orig, description: `Same building as ${orig} (same name, stories, floor area and year) under a second project code.` })

  faults.push({ id: 'pending_final', project_code: plan.pending.code, description: 'In construction, no brace submittal yet: only sd snapshots, none governing (legitimately pending).' })
  faults.push({ id: 'revised_submittal', project_code: plan.revised.code, phase: 'submittal', revision: 1, description: 'Submittal rev 0 and rev 1, not yet approved: rev 1 governs every brace.' })

  // (f) β and ω swapped on the sd snapshot of the first line's bottom story.
  const swapLine = firstLine(plan.swap.code)
  const sd = t.brace_values.find((r) => r.project_code === plan.swap.code && r.frame_line === swapLine && r.phase === 'sd')!
  ;[sd.beta, sd.omega] = [sd.omega, sd.beta]
  faults.push({ id: 'beta_omega_swap', project_code: plan.swap.code, frame_line: swapLine, level: sd.level as string, phase: 'sd', column: 'beta/omega', value: `${sd.beta}/${sd.omega}`, intended: `${sd.omega}/${sd.beta}`, description: 'β and ω swapped in one sd snapshot (β 1.4, ω 1.1).' })

  // (g) an empty story_height (a required column): the loader must reject this project and report it.
  const hLine = firstLine(plan.emptyHeight.code)
  const lv = t.levels.find((r) => r.project_code === plan.emptyHeight.code && r.frame_line === hLine && r.level_index === 2) as Row<'levels'>
  const intendedHeight = lv.story_height
  lv.story_height = null
  faults.push({ id: 'empty_story_height', project_code: plan.emptyHeight.code, frame_line: hLine, level: lv.level as string, column: 'story_height', value: null, intended: intendedHeight, description: 'Required story_height left empty on one levels row: a hard error that rejects the project.' })
  t.faults = faults
}
