import { scaleLinear, type ScaleLinear } from 'd3'
import type { CalibrationCost } from '@shared/schemas/calibration'
import { plotBox, ticksOf, type Margin, type PlotBox, type Tick } from './axes'

/**
 * Geometry of the cost of conservatism: one point per project, its conservatism (median assumed
 * Cmax / final Cmax; above 1 = the early factors were conservative) against the change in
 * lateral-system steel from the preliminary to the final design (final − preliminary, tons).
 * Projects without both tonnages cannot be placed and are counted instead. Pure.
 */

export type CostProject = CalibrationCost['projects'][number]

export interface CostPoint {
  cx: number
  cy: number
  /** Final − preliminary lateral tons. */
  delta: number
  unconservative: boolean
  project: CostProject
}

export interface CostGeometry {
  box: PlotBox
  x: ScaleLinear<number, number>
  y: ScaleLinear<number, number>
  xTicks: Tick[]
  yTicks: Tick[]
  /** Pixel x of conservatism 1 and pixel y of no change in tons. */
  one: number
  zero: number
  points: CostPoint[]
  /** Projects left out for want of a preliminary or final tonnage. */
  missing: number
}

export const COST_MARGIN: Margin = { top: 12, right: 16, bottom: 44, left: 60 }

/** Final − preliminary lateral tons, or undefined when either is missing. */
export function tonnageChange(p: Pick<CostProject, 'preliminaryLateralTons' | 'finalLateralTons'>): number | undefined {
  return p.preliminaryLateralTons === null || p.finalLateralTons === null ? undefined : p.finalLateralTons - p.preliminaryLateralTons
}

export function createCostScatter(projects: readonly CostProject[], width: number, height: number): CostGeometry {
  const box = plotBox(width, height, COST_MARGIN)
  const placed = projects.flatMap(p => {
    const delta = tonnageChange(p)
    return delta === undefined || !Number.isFinite(p.conservatism) ? [] : [{ p, delta }]
  })
  const cs = [1, ...placed.map(d => d.p.conservatism)]
  const ds = [0, ...placed.map(d => d.delta)]
  const pad = (lo: number, hi: number): [number, number] => {
    const span = hi - lo || 1
    return [lo - span * 0.06, hi + span * 0.06]
  }
  const x = scaleLinear().domain(pad(Math.min(...cs), Math.max(...cs))).range([box.left, box.left + box.width]).nice()
  const y = scaleLinear().domain(pad(Math.min(...ds), Math.max(...ds))).range([box.top + box.height, box.top]).nice()
  return {
    box,
    x,
    y,
    xTicks: ticksOf(x, Math.max(2, Math.round(box.width / 80))),
    yTicks: ticksOf(y, Math.max(2, Math.round(box.height / 45))),
    one: x(1),
    zero: y(0),
    points: placed.map(({ p, delta }) => ({ cx: x(p.conservatism), cy: y(delta), delta, unconservative: p.conservatism < 1 || p.unconservativeBraces > 0, project: p })),
    missing: projects.length - placed.length,
  }
}
