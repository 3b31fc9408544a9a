import type { Db } from '../db'
import { loadBenchmarkProjects } from './benchmarks'
import { analyticsReady, onPhaseLoad, warmAnalytics } from './calibration/store'
import { onPrecedentLoad, warmPrecedents } from './precedents'

type Log = (message: string) => void

/**
 * Builds, ahead of the first request, what the first analytics, precedent and benchmark requests
 * would otherwise wait for: the default phase's columns and their derived structures, the past
 * frames laid out for ranking, and the benchmark project list. In that order, one after the other
 * (they share the database and the event loop with the requests already arriving). A failure is
 * logged, never thrown: the request that needs the structure builds it then.
 */
export async function warmUp(db: Db, log: Log = console.error): Promise<{ analyticsMs: number; precedentsMs: number; benchmarksMs: number }> {
  const t0 = performance.now()
  await warmAnalytics(db, log)
  const t1 = performance.now()
  await warmPrecedents(db).catch(err => log(`precedent warm-up failed: ${err instanceof Error ? err.message : String(err)}`))
  const t2 = performance.now()
  await loadBenchmarkProjects(db).catch(err => log(`benchmark warm-up failed: ${err instanceof Error ? err.message : String(err)}`))
  const t3 = performance.now()
  return { analyticsMs: t1 - t0, precedentsMs: t2 - t1, benchmarksMs: t3 - t2 }
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
      `warm-up finished after ${((performance.now() - t0) / 1000).toFixed(1)} s (analytics ${(t.analyticsMs / 1000).toFixed(1)} s, ready: ${analyticsReady(db)}; precedents ${(t.precedentsMs / 1000).toFixed(1)} s; benchmarks ${(t.benchmarksMs / 1000).toFixed(1)} s)`,
    ),
  )
}
