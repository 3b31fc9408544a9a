/**
 * Cold cost of the calibration analytics: each answer computed from a phase's columns for many
 * distinct random filter combinations (no answer cache in the way), the straightforward reference
 * computation (api/src/services/calibration/reference.ts) against the app's (derived.ts), median and
 * p95 per endpoint and their ratio. Used by `npm run bench:analytics` on the ETL-loaded history; run
 * on its own (`npx tsx scripts/bench/analytics-cold.ts`) it times an in-memory synthetic history
 * (BENCH_BRACES, default 250,000). Not a test: it prints numbers.
 */
import { pathToFileURL } from 'node:url'
import type { CalibrationFilters, CalibrationGrouping, CalibrationQuantity, StartingFactorsQuery } from '../../shared/schemas/calibration'
import type { TonnageByCategory } from '../../shared/calibration'
import * as fast from '../../api/src/services/calibration/derived'
import * as ref from '../../api/src/services/calibration/reference'
import { pointsArrow } from '../../api/src/services/calibration/points'
import type { PhaseData } from '../../api/src/services/calibration/store'
import { startingIndex } from '../../api/src/services/calibration/starting-index'
import { rng } from './synthetic'
import { syntheticPhase } from './synthetic-phase'

const QUANTITIES: CalibrationQuantity[] = ['beta', 'omega', 'overstrength', 'stiffness', 'coreArea', 'tmax', 'cmax']
const GROUPINGS: CalibrationGrouping[] = ['supplier', 'configuration', 'yearBand', 'office', 'none']

type Tonnage = Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>

/** A random combination of the filters, drawn from the values present in `d`. */
export function randomFilters(d: PhaseData, rand: () => number): CalibrationFilters {
  const p = d.projects
  const distinct = (xs: (string | null)[]) => [...new Set(xs.filter((x): x is string => x !== null))].sort()
  const some = (xs: string[]) => xs.filter(() => rand() < 0.4)
  const f: CalibrationFilters = { phase: d.phase } as CalibrationFilters
  const years = p.yearDesigned.filter((y): y is number => y !== null)
  const y0 = Math.min(...years)
  const y1 = Math.max(...years)
  if (rand() < 0.35) f.supplier = some(distinct(p.supplier))
  if (rand() < 0.25) f.configuration = some([...d.configuration.values])
  if (rand() < 0.2) f.use = some(distinct(p.use))
  if (rand() < 0.2) f.sdc = some(distinct(p.sdc))
  if (rand() < 0.15) f.codeEdition = some(distinct(p.edition))
  if (rand() < 0.3) f.yearFrom = y0 + Math.floor(rand() * (y1 - y0 + 1))
  if (rand() < 0.2) f.yearTo = y0 + Math.floor(rand() * (y1 - y0 + 1))
  if (rand() < 0.15) f.storiesMin = 1 + Math.floor(rand() * 8)
  if (rand() < 0.1) f.storiesMax = 5 + Math.floor(rand() * 15)
  if (rand() < 0.2) f.coreAreaMin = Math.floor(rand() * 8)
  if (rand() < 0.15) f.coreAreaMax = 6 + Math.floor(rand() * 10)
  for (const k of ['supplier', 'configuration', 'use', 'sdc', 'codeEdition'] as const) if (f[k] && !f[k]!.length) delete f[k]
  return f
}

export function randomStartingQuery(d: PhaseData, rand: () => number): StartingFactorsQuery {
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
  const suppliers = [...new Set(d.projects.supplier.filter((x): x is string => x !== null))].sort()
  const q = { quantile: pick([0.5, 0.75, 0.9, 0.95]) } as StartingFactorsQuery
  if (rand() < 0.7) q.supplier = pick(suppliers)
  if (rand() < 0.5) q.configuration = pick(d.configuration.values)
  if (rand() < 0.4) {
    q.coreAreaMin = pick([2, 4])
    q.coreAreaMax = pick([8, 12])
  }
  if (rand() < 0.3) q.yearFrom = pick([2010, 2014, 2018])
  return q
}

const pctl = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))]!
}

export interface ColdOptions {
  keys?: number
  seed?: number
  tolerance?: number
  settings?: { minGroupSize: number; habitYears: number }
  /** Also time the reference computation (slow), for the before/after ratio. */
  reference?: boolean
  only?: string[]
}

/**
 * Times every endpoint's computation on `keys` distinct random queries; the fast path runs on a
 * fresh copy of the phase data (so per-version precomputation is not yet done) — its first-use
 * build is reported on its own line.
 */
export function coldReport(d: PhaseData, tonnage: Tonnage, o: ColdOptions = {}): void {
  const keys = o.keys ?? 50
  const tolerance = o.tolerance ?? 0.1
  const settings = o.settings ?? { minGroupSize: 5, habitYears: 5 }
  const rand = rng(o.seed ?? 7)
  const filters = Array.from({ length: keys }, () => randomFilters(d, rand))
  const pickQ = () => QUANTITIES[Math.floor(rand() * QUANTITIES.length)]!
  const pickG = () => GROUPINGS[Math.floor(rand() * GROUPINGS.length)]!
  const sorts = ['ratio', 'project', 'year', 'supplier'] as const
  type Case = { name: string; run: (impl: 'ref' | 'fast', d: PhaseData, i: number) => unknown }
  const qs = filters.map(() => ({ q: pickQ(), g: pickG(), sort: sorts[Math.floor(rand() * 4)]!, dir: rand() < 0.5 ? ('asc' as const) : ('desc' as const), limit: rand() < 0.5 ? 25 : 100 }))
  const starting = filters.map(() => randomStartingQuery(d, rand))
  const cases: Case[] = [
    { name: 'summary', run: (impl, d, i) => (impl === 'ref' ? ref.refSummary : fast.summaryAnswer)(d, filters[i]!, qs[i]!.q, qs[i]!.g, tolerance) },
    { name: 'trend', run: (impl, d, i) => (impl === 'ref' ? ref.refTrend : fast.trendAnswer)(d, filters[i]!, qs[i]!.q) },
    { name: 'misses', run: (impl, d, i) => (impl === 'ref' ? ref.refMisses : fast.missesAnswer)(d, filters[i]!, qs[i]!.q, qs[i]!, tolerance) },
    { name: 'cost', run: (impl, d, i) => (impl === 'ref' ? ref.refCost : fast.costAnswer)(d, filters[i]!, tonnage) },
    { name: 'starting-factors', run: (impl, d, i) => (impl === 'ref' ? ref.refStarting : fast.startingAnswer)(d, starting[i]!, settings) },
    // The reference above is the plain computation; this row's reference is the app's code before derived.ts.
    { name: 'starting (vs prev)', run: (impl, d, i) => (impl === 'ref' ? ref.previousStarting : fast.startingAnswer)(d, starting[i]!, settings) },
    { name: 'points (Arrow)', run: (impl, d, i) => (impl === 'ref' ? ref.refPointsArrow(ref.refPointRows(d, filters[i]!, qs[i]!.q, qs[i]!.g)) : pointsArrow(fast.pointRowsOf(d, filters[i]!, qs[i]!.q, qs[i]!.g))) },
  ]
  const fresh = (): PhaseData => ({ ...d })
  console.log(`\nCold cost per answer at ${d.n} braces, ${keys} distinct random queries per endpoint (no answer cache):`)
  console.log('endpoint            ' + (o.reference ? 'reference p50   ref p95    ' : '') + 'fast p50    fast p95   1st query' + (o.reference ? '   p50 ratio' : ''))
  let t = performance.now()
  const fd = fresh()
  fast.prepare(fd)
  startingIndex(fd)
  console.log(`per-version build of the derived structures (once per data version): ${(performance.now() - t).toFixed(0)} ms`)
  for (const c of cases) {
    if (o.only && !o.only.includes(c.name)) continue
    t = performance.now()
    c.run('fast', fd, 0)
    const first = performance.now() - t
    const times = { ref: [] as number[], fast: [] as number[] }
    for (let i = 0; i < keys; i++) {
      for (const impl of o.reference ? (['ref', 'fast'] as const) : (['fast'] as const)) {
        t = performance.now()
        c.run(impl, impl === 'fast' ? fd : d, i)
        times[impl].push(performance.now() - t)
      }
    }
    const f = (v: number) => `${v.toFixed(2)} ms`.padStart(10)
    const line = [c.name.padEnd(18)]
    if (o.reference) line.push(f(pctl(times.ref, 0.5)), f(pctl(times.ref, 0.95)))
    line.push(f(pctl(times.fast, 0.5)), f(pctl(times.fast, 0.95)), f(first))
    if (o.reference) line.push(`${(pctl(times.ref, 0.5) / pctl(times.fast, 0.5)).toFixed(1)}×`.padStart(10))
    console.log(line.join('  '))
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const braces = Number(process.env.BENCH_BRACES ?? 250_000)
  const d = syntheticPhase(11, Math.round(braces / 30.5))
  const tonnage: Tonnage = new Map(d.projects.id.map((id, j) => [id, { preliminary: { lateral_total: 100 + j % 40 }, final: { beams: 30 + (j % 7), columns: 40, connections: 5 } }]))
  console.log(`synthetic history: ${d.n} braces, ${d.projects.id.length} projects`)
  coldReport(d, tonnage, { reference: process.env.BENCH_REFERENCE !== '0', keys: Number(process.env.BENCH_KEYS ?? 50), only: process.env.BENCH_ONLY?.split(',') })
}
