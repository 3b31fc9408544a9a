import { quadtree, scaleLinear, type Quadtree, type ScaleLinear } from 'd3'
import { plotBox, ticksOf, type Margin, type PlotBox, type Tick } from './axes'

/**
 * Geometry of the assumed-versus-final scatter: one point per brace, the line final = assumed and
 * the ±tolerance band. Both axes share one domain, so the line y = x runs at 45° and a point's
 * distance above it reads directly as an underestimate. Pure: the chart component only draws it.
 *
 * The band is the ratio band of the summaries: |assumed / final − 1| ≤ tolerance, i.e.
 * final between assumed / (1 + tolerance) and assumed / (1 − tolerance).
 */

export interface ScatterDatum {
  assumed: number
  final: number
  group: string
}

export interface ScatterInput<D extends ScatterDatum> {
  points: readonly D[]
  /** Fraction, e.g. 0.1 for ±10 %. */
  tolerance: number
  colors: ReadonlyMap<string, string>
  width: number
  height: number
  margin?: Partial<Margin>
}

export interface ScatterPoint<D> {
  cx: number
  cy: number
  color: string
  datum: D
}

export interface ScatterGeometry<D> {
  box: PlotBox
  x: ScaleLinear<number, number>
  y: ScaleLinear<number, number>
  xTicks: Tick[]
  yTicks: Tick[]
  /** The line final = assumed across the plot. */
  diagonal: { x1: number; y1: number; x2: number; y2: number }
  /** Closed path of the tolerance band (draw it clipped to `box`). */
  bandPath: string
  points: ScatterPoint<D>[]
}

export const SCATTER_MARGIN: Margin = { top: 12, right: 16, bottom: 44, left: 60 }

/** The shared [lo, hi] of assumed and final values, padded 5 % each side; [0, 1] when there is nothing finite. */
export function sharedDomain(points: readonly ScatterDatum[]): [number, number] {
  let lo = Infinity
  let hi = -Infinity
  for (const p of points) {
    for (const v of [p.assumed, p.final]) {
      if (!Number.isFinite(v)) continue
      if (v < lo) lo = v
      if (v > hi) hi = v
    }
  }
  if (!Number.isFinite(lo)) return [0, 1]
  if (lo === hi) return [lo * 0.9, hi * 1.1 || 1]
  const pad = (hi - lo) * 0.05
  return [Math.max(lo > 0 ? 0 : -Infinity, lo - pad), hi + pad]
}

export function createScatter<D extends ScatterDatum>(input: ScatterInput<D>): ScatterGeometry<D> {
  const box = plotBox(input.width, input.height, { ...SCATTER_MARGIN, ...input.margin })
  const domain = sharedDomain(input.points)
  const x = scaleLinear().domain(domain).range([box.left, box.left + box.width]).nice()
  const y = scaleLinear().domain(x.domain()).range([box.top + box.height, box.top])
  const [d0, d1] = x.domain() as [number, number]
  const tol = Math.min(Math.max(input.tolerance, 0), 0.95)
  const lower = (v: number) => v / (1 + tol)
  const upper = (v: number) => v / (1 - tol)
  const bandPath = `M${x(d0)},${y(lower(d0))}L${x(d1)},${y(lower(d1))}L${x(d1)},${y(upper(d1))}L${x(d0)},${y(upper(d0))}Z`
  const fallback = '#6B7A82'
  const points: ScatterPoint<D>[] = []
  for (const datum of input.points) {
    if (!Number.isFinite(datum.assumed) || !Number.isFinite(datum.final)) continue
    points.push({ cx: x(datum.assumed), cy: y(datum.final), color: input.colors.get(datum.group) ?? fallback, datum })
  }
  return {
    box,
    x,
    y,
    xTicks: ticksOf(x, Math.max(2, Math.round(box.width / 80))),
    yTicks: ticksOf(y, Math.max(2, Math.round(box.height / 50))),
    diagonal: { x1: x(d0), y1: y(d0), x2: x(d1), y2: y(d1) },
    bandPath,
    points,
  }
}

/** Where a brace lies against the band, by its ratio assumed / final (the summaries' rule). */
export function bandSide(assumed: number, final: number, tolerance: number): 'under' | 'within' | 'over' {
  const ratio = assumed / final
  if (ratio < 1 - tolerance) return 'under'
  if (ratio > 1 + tolerance) return 'over'
  return 'within'
}

/** A finder for the point nearest to the pointer (within `radius` px), for hover and click on SVG or canvas alike. */
export function createPointFinder<D>(points: readonly ScatterPoint<D>[]): (px: number, py: number, radius: number) => ScatterPoint<D> | undefined {
  let tree: Quadtree<ScatterPoint<D>> | undefined
  return (px, py, radius) => {
    tree ??= quadtree<ScatterPoint<D>>()
      .x(p => p.cx)
      .y(p => p.cy)
      .addAll(points as ScatterPoint<D>[])
    return tree.find(px, py, radius)
  }
}

/** Above this many points the scatter draws on a canvas instead of one SVG element per brace. */
export const CANVAS_THRESHOLD = 3000

/** SVG circles of the points, for the SVG export of a canvas-drawn scatter. */
export function circlesMarkup(points: readonly Pick<ScatterPoint<unknown>, 'cx' | 'cy' | 'color'>[], r = 3, opacity = 0.7): string {
  const round = (v: number) => Math.round(v * 10) / 10
  return points.map(p => `<circle cx="${round(p.cx)}" cy="${round(p.cy)}" r="${r}" fill="${p.color}" fill-opacity="${opacity}"/>`).join('')
}
