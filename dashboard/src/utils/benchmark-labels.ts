import { BENCHMARK_METRICS, METRIC_UNITS, type BenchmarkGrouping, type BenchmarkMetric } from '@shared/schemas/benchmarks'
import type { UnitSystem } from '@shared/units/systems'
import { formatFigure } from '@shared/benchmarks/proposal-sheet'

/** Words and number formats of the Benchmarks screen. Pure. */

export const GROUPING_LABELS: Record<BenchmarkGrouping, string> = {
  use: 'Building use',
  heightBand: 'Height band',
  sdc: 'Seismic design category',
  region: 'Region',
  years: 'Years designed',
}

export const METRIC_LABELS: Record<BenchmarkMetric, string> = {
  lateralPerFloorArea: 'Lateral-system steel per floor area',
  structuralPerFloorArea: 'Total structural steel per floor area',
  lateralPerFrame: 'Lateral steel per braced frame',
  lateralPerStory: 'Lateral steel per story',
  lateralPerBaseShear: 'Lateral steel per unit base shear',
  bracePerCoreArea: 'Brace steel per core area',
  lateralEstimateSpread: 'Lateral steel: final against preliminary',
  structuralEstimateSpread: 'Structural steel: final against preliminary',
}

export const METRIC_OPTIONS = BENCHMARK_METRICS.map(m => ({ label: METRIC_LABELS[m], value: m }))

export const isSpread = (m: BenchmarkMetric) => m === 'lateralEstimateSpread' || m === 'structuralEstimateSpread'

/** The unit shown for a metric ("%" for the spreads, which the API gives as fractions). */
export function metricUnit(m: BenchmarkMetric, units: UnitSystem): string {
  return isSpread(m) ? '%' : METRIC_UNITS[m][units]
}

/** Decimals that suit each metric's size in each system. */
function digitsOf(m: BenchmarkMetric, units: UnitSystem): number {
  if (m === 'lateralPerFloorArea' || m === 'structuralPerFloorArea') return units === 'si' ? 1 : 2
  if (m === 'lateralPerBaseShear') return 3
  if (m === 'bracePerCoreArea') return units === 'si' ? 4 : 1
  return 1
}

/** A metric value for display: spreads as signed percent (+12.5 %), the rest with suitable decimals. */
export function formatMetric(m: BenchmarkMetric, v: number | null | undefined, units: UnitSystem): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—'
  if (isSpread(m)) return `${v > 0 ? '+' : v < 0 ? '−' : ''}${formatFigure(Math.abs(v) * 100, 1)}`
  return formatFigure(v, digitsOf(m, units))
}

/** A group key for people: building uses capitalised, the rest as the API names them. */
export function groupKeyLabel(groupBy: BenchmarkGrouping, key: string): string {
  if (key === 'unknown') return 'Not recorded'
  if (groupBy === 'use') return key.charAt(0).toUpperCase() + key.slice(1)
  if (groupBy === 'sdc') return `SDC ${key}`
  return key
}
