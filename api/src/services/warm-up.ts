import { setImmediate as nextTurn } from 'node:timers/promises'
import { BENCHMARK_GROUPINGS, BenchmarkQuery } from '@shared/schemas/benchmarks'
import { CALIBRATION_GROUPINGS, CALIBRATION_QUANTITIES, CalibrationFilters, GroupQuery, MissesQuery, QuantityQuery, StartingFactorsQuery } from '@shared/schemas/calibration'
import type { Db } from '../db'
import { benchmarks, loadBenchmarkProjects } from './benchmarks'
import { calibrationCost, calibrationMisses, calibrationOptions, calibrationSummary, calibrationTrend, pointsBody, startingFactors } from './calibration/answers'
import { warmCode } from './code-warm-up'
import { analyticsReady, onPhaseLoad, warmAnalytics } from './calibration/store'
import { onPrecedentLoad, warmPrecedents } from './precedents'

type Log = (message: string) => void

/**
 * Builds, ahead of the first request, what the first analytics, precedent and benchmark requests
 * would otherwise wait for: the default phase's columns and their derived structures, the past
 * frames laid out for ranking, the benchmark project list, then the answers the screens open with
 * (warmScreens), then filtered answers computed only to compile their code (warmCode). In that
 * order, one after the other (they share the database and the event loop with the requests already
 * arriving). A failure is logged, never thrown: the request that needs the structure builds it then.
 */
export async function warmUp(db: Db, log: Log = console.error): Promise<{ analyticsMs: number; precedentsMs: number; benchmarksMs: number; screensMs: number; codeMs: number }> {
  const t0 = performance.now()
  await warmAnalytics(db, log)
  const t1 = performance.now()
  await warmPrecedents(db).catch(err => log(`precedent warm-up failed: ${err instanceof Error ? err.message : String(err)}`))
  const t2 = performance.now()
  const listed = await loadBenchmarkProjects(db).then(
    () => true,
    err => {
      log(`benchmark warm-up failed: ${err instanceof Error ? err.message : String(err)}`)
      return false
    },
  )
  const t3 = performance.now()
  // Only when the parts before succeeded: with the database gone, each answer would fail again.
  const ok = analyticsReady(db) && listed
  if (ok) await warmScreens(db).catch(err => log(`screen warm-up failed: ${err instanceof Error ? err.message : String(err)}`))
  const t4 = performance.now()
  if (ok) await warmCode(db).catch(err => log(`code warm-up failed: ${err instanceof Error ? err.message : String(err)}`))
  const t5 = performance.now()
  return { analyticsMs: t1 - t0, precedentsMs: t2 - t1, benchmarksMs: t3 - t2, screensMs: t4 - t3, codeMs: t5 - t4 }
}

/**
 * The answers the analytics and benchmark screens open with: no filter, each quantity and grouping
 * their selectors offer (the braces chart for the opening view only), and each audience of the
 * benchmarks. Computed into the answer cache one at a
 * time, yielding to the requests between two, so the first users after a start find them ready and
 * the code that computes the others already compiled. Returns how many answers it computed.
 */
export async function warmScreens(db: Db): Promise<number> {
  const filters = CalibrationFilters.parse({})
  const answers: (() => Promise<unknown>)[] = [() => calibrationOptions(db), () => calibrationCost(db, filters), () => startingFactors(db, StartingFactorsQuery.parse({}))]
  for (const quantity of CALIBRATION_QUANTITIES) {
    answers.push(() => calibrationTrend(db, filters, quantity), () => calibrationMisses(db, filters, quantity, MissesQuery.parse({})))
    for (const groupBy of CALIBRATION_GROUPINGS) answers.push(() => calibrationSummary(db, filters, quantity, groupBy))
  }
  // The braces chart of the review's opening view (the API's default quantity and grouping, which the
  // dashboard opens with), as the dashboard asks for it: Arrow, gzipped. One set only: every quantity
  // and grouping over the whole history would be a few megabytes each, most of the answer cache.
  const { quantity } = QuantityQuery.parse({})
  const { groupBy } = GroupQuery.parse({})
  answers.push(() => pointsBody(db, filters, quantity, groupBy, { arrow: true, gzip: true }))
  for (const role of ['principal', 'bd'] as const) {
    for (const groupBy of BENCHMARK_GROUPINGS) for (const units of ['us', 'si'] as const) answers.push(() => benchmarks(db, BenchmarkQuery.parse({ groupBy, units }), role))
  }
  for (const answer of answers) {
    await answer()
    await nextTurn()
  }
  return answers.length
}

/**
 * What a server does once it listens: logs every rebuild of the analytics columns and of the
 * precedent history, and runs the
 * warm-up in the background, logging how long each part took (`/api/health` reports the analytics
 * as ready once the columns are loaded).
 */
export function startWarmUp(db: Db, log: Log = console.log): void {
  onPhaseLoad(r => log(`analytics: ${r.phase} columns at version ${r.version}: ${r.kind}${r.kind === 'delta' ? ` (${r.projects} projects changed)` : ''}, ${r.rows} rows in ${r.ms} ms`))
  onPrecedentLoad(r => log(`precedents: history at version ${r.version}: ${r.kind}${r.kind === 'delta' ? ` (${r.projects} projects changed)` : ''}, ${r.frames} frames in ${r.ms} ms`))
  const t0 = performance.now()
  void warmUp(db, log).then(t =>
    log(
      `warm-up finished after ${((performance.now() - t0) / 1000).toFixed(1)} s (analytics ${(t.analyticsMs / 1000).toFixed(1)} s, ready: ${analyticsReady(db)}; precedents ${(t.precedentsMs / 1000).toFixed(1)} s; benchmarks ${(t.benchmarksMs / 1000).toFixed(1)} s; screens' opening answers ${(t.screensMs / 1000).toFixed(1)} s; filtered answers compiled ${(t.codeMs / 1000).toFixed(1)} s)`,
    ),
  )
}
