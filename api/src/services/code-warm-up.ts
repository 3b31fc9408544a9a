import { setImmediate as nextTurn } from 'node:timers/promises'
import { CALIBRATION_GROUPINGS, CALIBRATION_QUANTITIES, MISS_SORTS, StartingFactorsQuery, type CalibrationFilters } from '@shared/schemas/calibration'
import type { Db } from '../db'
import { tonnageByProject } from './calibration/answers'
import { costAnswer, missesAnswer, pointRowsOf, startingAnswer, summaryAnswer, trendAnswer } from './calibration/derived'
import { pointsArrow } from './calibration/points'
import { getCalibrationSettings } from './calibration/settings'
import { withoutKeptStats } from './calibration/starting-index'
import { DEFAULT_PHASE, phaseData, type PhaseData } from './calibration/store'
import { getSizingDefaults } from './settings'

/*
 * The code warm-up: the analytics answers computed for filtered questions, and thrown away, before
 * the first user asks one.
 *
 * The screens' opening answers (warmScreens) have no filter, so they compile the answer code only
 * for that case. V8's optimising compiler leaves out the branches it has not seen taken (a supplier
 * filter, a core-area band, a grouping by configuration), so the first filtered questions after a
 * start dropped back to unoptimised code until it compiled again: on a 250,000-brace history the
 * summaries and trends of the first seconds took 3–10 times as long as the same answers a minute
 * later, while 50 users asked their first questions at once. Answering a few filtered questions
 * first lets the compiler see every branch.
 *
 * Nothing computed here is kept: the answers bypass the answer cache, and the starting factors are
 * computed without keeping their group stats (withoutKeptStats), so a user's question is answered
 * exactly as it would have been, only by compiled code.
 */

/** The most frequent non-null values of `values`, most frequent first (ties: first seen first). */
function commonest<T>(values: readonly (T | null | undefined)[], k: number): T[] {
  const counts = new Map<T, number>()
  for (const v of values) if (v !== null && v !== undefined) counts.set(v, (counts.get(v) ?? 0) + 1)
  return [...counts].sort((a, b) => b[1] - a[1]).slice(0, k).map(([v]) => v)
}

/** The `q` quantile (nearest rank) of the finite values of `values`, or undefined if there are none. */
function quantileOf(values: Iterable<number | null | undefined>, q: number): number | undefined {
  const xs: number[] = []
  for (const v of values) if (typeof v === 'number' && Number.isFinite(v)) xs.push(v)
  if (!xs.length) return undefined
  xs.sort((a, b) => a - b)
  return xs[Math.min(xs.length - 1, Math.floor(q * xs.length))]
}

/** `f` without its undefined fields and empty lists. */
function compact(f: Partial<CalibrationFilters>): Partial<CalibrationFilters> {
  return Object.fromEntries(Object.entries(f).filter(([, v]) => v !== undefined && !(Array.isArray(v) && v.length === 0))) as Partial<CalibrationFilters>
}

/**
 * Filters drawn from the history itself: each filter of the review (supplier, configuration, years,
 * SDC and edition, core-area band, use and stories) alone or in a pair, then all of them together.
 * Values are the history's commonest ones and its quartiles, so each filter alone selects something.
 */
export function warmFilterShapes(d: PhaseData): Partial<CalibrationFilters>[] {
  const p = d.projects
  const years = p.yearDesigned
  const stories = p.stories
  // Every 97th row is plenty for the quartiles of the core areas.
  const cores: number[] = []
  for (let r = 0; r < d.n; r += 97) cores.push(d.finalCoreArea[r]!)
  const configCounts = new Int32Array(d.configuration.values.length)
  for (let r = 0; r < d.n; r++) configCounts[d.configuration.codes[r]!]!++
  const configs = [...d.configuration.values.keys()].sort((a, b) => configCounts[b]! - configCounts[a]!).slice(0, 2).map(k => d.configuration.values[k]!)
  const shapes = [
    { supplier: commonest(p.supplier, 1) },
    { supplier: commonest(p.supplier, 2), yearFrom: quantileOf(years, 0.5) },
    { configuration: configs },
    { yearFrom: quantileOf(years, 0.25), yearTo: quantileOf(years, 0.75) },
    { sdc: commonest(p.sdc, 1), codeEdition: commonest(p.edition, 1) },
    { coreAreaMin: quantileOf(cores, 0.25), coreAreaMax: quantileOf(cores, 0.75) },
    { use: commonest(p.use, 2), storiesMin: quantileOf(stories, 0.5) },
    { storiesMax: quantileOf(stories, 0.5), coreAreaMin: quantileOf(cores, 0.5) },
  ].map(compact)
  return [...shapes, compact(Object.assign({}, ...shapes))].filter(f => Object.keys(f).length > 0)
}

/**
 * Computes, without keeping them, the analytics answers of every filter of warmFilterShapes across
 * the quantities, groupings and miss orders, one at a time with a turn of the event loop between
 * two. Returns how many answers it computed.
 */
export async function warmCode(db: Db): Promise<number> {
  const d = await phaseData(db, DEFAULT_PHASE)
  const [sizing, settings, tonnage] = await Promise.all([getSizingDefaults(db), getCalibrationSettings(db), tonnageByProject(db)])
  const tolerance = sizing.stiffnessTolerance
  const answers: (() => unknown)[] = []
  warmFilterShapes(d).forEach((f, i) => {
    const quantity = (k: number) => CALIBRATION_QUANTITIES[(i + k) % CALIBRATION_QUANTITIES.length]!
    CALIBRATION_GROUPINGS.forEach((groupBy, k) => answers.push(() => summaryAnswer(d, f, quantity(k), groupBy, tolerance)))
    answers.push(
      () => trendAnswer(d, f, quantity(0)),
      () => missesAnswer(d, f, quantity(1), { sort: MISS_SORTS[i % MISS_SORTS.length]!, dir: i % 2 ? 'asc' : 'desc', limit: i % 2 ? 25 : 100 }, tolerance),
      () => costAnswer(d, f, tonnage),
      () => pointsArrow(pointRowsOf(d, f, quantity(2), CALIBRATION_GROUPINGS[i % CALIBRATION_GROUPINGS.length]!)),
    )
    const starting = StartingFactorsQuery.parse({
      supplier: f.supplier?.[0],
      configuration: f.configuration?.[0],
      coreAreaMin: f.coreAreaMin,
      coreAreaMax: f.coreAreaMax,
      yearFrom: f.yearFrom,
      yearTo: f.yearTo,
      quantile: [0.5, 0.75, 0.9, 0.95][i % 4],
    })
    answers.push(() => withoutKeptStats(() => startingAnswer(d, starting, settings)))
  })
  for (const answer of answers) {
    answer()
    await nextTurn()
  }
  return answers.length
}
