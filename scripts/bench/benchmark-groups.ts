/**
 * `npm run bench:benchmarks` — the cost of a benchmark answer's percentile bands over a synthetic
 * history of BENCH_PROJECTS finished projects (default 5,200, as in `npm run bench:load`), grouped
 * by each benchmark grouping: the app's `metricBands` (each metric's finite values gathered into a
 * typed array and sorted there) against the plain computation (`percentileBand` of each metric's
 * values, an array per metric). Prints the medians per grouping and their ratio, measured in this
 * one run. Not a test: nothing passes or fails.
 */
import { groupKeyOf, metricBands, projectMetrics, type BenchmarkProject, type Units } from '../../shared/benchmarks/groups'
import { percentileBand } from '../../shared/benchmarks/percentiles'
import { BENCHMARK_GROUPINGS, BENCHMARK_METRICS } from '../../shared/schemas/benchmarks'
import { rng } from './synthetic'

const N = Number(process.env.BENCH_PROJECTS ?? 5200)
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 20)
const r = rng(3)
const pick = <T>(xs: readonly T[]) => xs[Math.floor(r() * xs.length)]!
const list: BenchmarkProject[] = Array.from({ length: N }, (_, i) => ({
  code: `P-${i}`,
  name: `Project ${i}`,
  clientConfidential: r() < 0.2,
  benchmarkPermitted: r() < 0.9,
  buildingUse: pick(['office', 'laboratory', 'healthcare', 'school', 'residential', 'parking']),
  stories: 1 + Math.floor(r() * 20),
  sdc: pick(['C', 'D', 'E']),
  region: pick(['north', 'south', 'west']),
  yearDesigned: 2005 + Math.floor(r() * 20),
  floorAreaFt2: r() < 0.05 ? null : 20_000 + Math.round(r() * 200) * 1000,
  frames: 2 + Math.floor(r() * 8),
  baseShearKip: 200 + Math.round(r() * 2000),
  totalCoreAreaIn2: 100 + Math.round(r() * 1000),
  tonnage: {
    preliminary: { lateral_total: 50 + Math.round(r() * 300), structural_total: 500 + Math.round(r() * 3000) },
    final: { braces: 10 + Math.round(r() * 50), beams: 20 + Math.round(r() * 100), columns: 20 + Math.round(r() * 100), connections: 5 + Math.round(r() * 20), structural_total: 500 + Math.round(r() * 3000) },
  },
}))

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1]!
const time = (f: () => unknown) => {
  const t = performance.now()
  f()
  return performance.now() - t
}
// The figures of each project are computed once in both (the app keeps them per project object).
const memo = { us: new Map<BenchmarkProject, ReturnType<typeof projectMetrics>>(), si: new Map<BenchmarkProject, ReturnType<typeof projectMetrics>>() }
const metricsOf = (p: BenchmarkProject, units: Units) => memo[units].get(p) ?? memo[units].set(p, projectMetrics(p, units)).get(p)!
const plainBands = (members: readonly BenchmarkProject[], units: Units) => {
  const rows = members.map(m => metricsOf(m, units))
  return Object.fromEntries(BENCHMARK_METRICS.map(k => [k, percentileBand(rows.map(r => r[k]))]))
}
for (const units of ['us', 'si'] as const) {
  plainBands(list, units)
  metricBands(list, units)
}

console.log(`${N} projects, ${ROUNDS} rounds per grouping (each a different subset, both units)`)
console.log('grouping      plain p50      metricBands p50   ratio')
for (const g of BENCHMARK_GROUPINGS) {
  const plain: number[] = []
  const app: number[] = []
  for (let i = 0; i < ROUNDS; i++) {
    const units = i % 2 ? 'si' : 'us'
    const subset = i === 0 ? list : list.filter((_, j) => j % (i + 2) !== 0)
    const groups = new Map<string, BenchmarkProject[]>()
    for (const p of subset) groups.set(groupKeyOf(p, g), [...(groups.get(groupKeyOf(p, g)) ?? []), p])
    plain.push(time(() => [...groups.values()].map(m => plainBands(m, units))))
    app.push(time(() => [...groups.values()].map(m => metricBands(m, units))))
  }
  console.log(`${g.padEnd(12)}  ${median(plain).toFixed(2).padStart(8)} ms  ${median(app).toFixed(2).padStart(12)} ms  ${(median(plain) / median(app)).toFixed(1).padStart(6)}×`)
}
