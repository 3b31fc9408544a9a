import { area, line, scaleLinear, type ScaleLinear } from 'd3'
import { integerTicksOf, plotBox, ticksOf, type Margin, type PlotBox, type Tick } from './axes'

/**
 * Geometry of a by-year line chart: one or more series (a median, a suggested-versus-habit
 * rate), each with an optional band (the interquartile range) and dots at its years. Used by the
 * calibration trend and the starting-factor back-test. Pure.
 */

export interface LinePoint {
  x: number
  y: number
  /** Band around the line at this x (e.g. q1 and q3). */
  lo?: number
  hi?: number
}

export interface LineSeries {
  key: string
  label: string
  color: string
  points: readonly LinePoint[]
  /** Dashed stroke (e.g. the habit, against the solid suggestion). */
  dashed?: boolean
}

export interface LineChartInput {
  series: readonly LineSeries[]
  width: number
  height: number
  /** Fixed y domain (e.g. [0, 1] for rates); otherwise from the data, with `include` values. */
  yDomain?: [number, number]
  /** Values the y axis must show (e.g. ratio 1). */
  include?: readonly number[]
  yFormat?: (v: number) => string
  margin?: Partial<Margin>
}

export interface DrawnSeries {
  key: string
  label: string
  color: string
  dashed: boolean
  path: string
  bandPath: string | undefined
  dots: { cx: number; cy: number; x: number; y: number }[]
}

export interface LineChartGeometry {
  box: PlotBox
  x: ScaleLinear<number, number>
  y: ScaleLinear<number, number>
  xTicks: Tick[]
  yTicks: Tick[]
  series: DrawnSeries[]
}

export const LINE_MARGIN: Margin = { top: 12, right: 16, bottom: 32, left: 52 }

export function createLineChart(input: LineChartInput): LineChartGeometry {
  const box = plotBox(input.width, input.height, { ...LINE_MARGIN, ...input.margin })
  const all = input.series.flatMap(s => s.points)
  const xs = all.map(p => p.x).filter(Number.isFinite)
  const xLo = xs.length ? Math.min(...xs) : 0
  const xHi = xs.length ? Math.max(...xs) : 1
  // One year alone still gets a little width either side.
  const x = scaleLinear()
    .domain(xLo === xHi ? [xLo - 1, xHi + 1] : [xLo, xHi])
    .range([box.left, box.left + box.width])
  let yDomain = input.yDomain
  if (!yDomain) {
    const ys = [...all.flatMap(p => [p.y, p.lo, p.hi]), ...(input.include ?? [])].filter((v): v is number => v !== undefined && Number.isFinite(v))
    const lo = ys.length ? Math.min(...ys) : 0
    const hi = ys.length ? Math.max(...ys) : 1
    const pad = lo === hi ? Math.abs(lo) * 0.1 || 1 : (hi - lo) * 0.06
    yDomain = [lo - pad, hi + pad]
  }
  const y = scaleLinear().domain(yDomain).range([box.top + box.height, box.top])
  if (!input.yDomain) y.nice()
  const lineGen = line<LinePoint>()
    .x(p => x(p.x))
    .y(p => y(p.y))
  const bandGen = area<LinePoint>()
    .x(p => x(p.x))
    .y0(p => y(p.lo ?? p.y))
    .y1(p => y(p.hi ?? p.y))
  const series = input.series.map((s): DrawnSeries => {
    const pts = [...s.points].filter(p => Number.isFinite(p.x) && Number.isFinite(p.y)).sort((a, b) => a.x - b.x)
    const banded = pts.some(p => p.lo !== undefined && p.hi !== undefined)
    return {
      key: s.key,
      label: s.label,
      color: s.color,
      dashed: s.dashed ?? false,
      path: lineGen(pts) ?? '',
      bandPath: banded ? (bandGen(pts) ?? undefined) : undefined,
      dots: pts.map(p => ({ cx: x(p.x), cy: y(p.y), x: p.x, y: p.y })),
    }
  })
  return {
    box,
    x,
    y,
    xTicks: integerTicksOf(x, Math.max(2, Math.round(box.width / 70))),
    yTicks: ticksOf(y, Math.max(2, Math.round(box.height / 45)), input.yFormat),
    series,
  }
}
