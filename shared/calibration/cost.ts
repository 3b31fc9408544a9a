import type { CalibrationCost } from '../schemas/calibration'
import { quantileOfSorted, sortedCopy } from './stats'

/** Short tons by tonnage category for one stage of one project (stored unit: short ton). */
export type TonnageByCategory = Partial<Record<'braces' | 'beams' | 'columns' | 'connections' | 'lateral_total' | 'structural_total', number>>

export interface CostProjectInput {
  code: string
  name: string
  yearDesigned: number | null
  /** Per brace assumed / final Tmax and Cmax ratios (NaN where a side is missing), aligned by brace. */
  tmaxRatios: ArrayLike<number>
  cmaxRatios: ArrayLike<number>
  preliminary: TonnageByCategory
  final: TonnageByCategory
}

export const COST_METHOD =
  'Estimate (common practice, no source). Conservatism c = median over the project’s braces of assumed Cmax / final Cmax. ' +
  'Beams, columns and connections of the braced frames are capacity-designed for the brace adjusted strengths, so their steel is taken to scale ' +
  'in proportion to the Cmax the frame was designed for; the brace cores themselves are sized from the demand, not from β, ω or Ry, and are left out. ' +
  'The final tonnage is the steel as designed from the assumed factors, so the steel attributable to factors above the final ones is ' +
  '(final beams + columns + connections tons) × (1 − 1/c) when c > 1, and 0 when c ≤ 1. Where a project records only a lateral total, ' +
  'that total is used instead (an upper estimate, since it includes the braces). Member sizes come in discrete steps and drift, ' +
  'gravity and minimum sizes govern some members, so the true saving would need a redesign; read this as an upper-bound estimate.'

/** Lateral-system tons of a stage: the lateral total, else braces + beams + columns + connections (null when none). */
export function lateralTons(t: TonnageByCategory): number | null {
  if (t.lateral_total !== undefined) return t.lateral_total
  const parts = [t.braces, t.beams, t.columns, t.connections].filter((v): v is number => v !== undefined)
  return parts.length ? parts.reduce((a, b) => a + b, 0) : null
}

/** The capacity-designed part of the final lateral steel: beams + columns + connections, else the lateral total. */
export function capacityDesignedTons(t: TonnageByCategory): number | null {
  const parts = [t.beams, t.columns, t.connections].filter((v): v is number => v !== undefined)
  if (parts.length) return parts.reduce((a, b) => a + b, 0)
  return lateralTons(t)
}

/** Tons attributable to conservatism c on `tons` of capacity-designed steel: tons × (1 − 1/c) for c > 1, else 0. */
export function attributableTons(tons: number, conservatism: number): number {
  return conservatism > 1 ? tons * (1 - 1 / conservatism) : 0
}

/** One project's part of the cost of conservatism: its row (null when it has no Cmax ratio) and its unconservative entry (null when none). */
export interface ProjectCost {
  project: CalibrationCost['projects'][number] | null
  unconservative: CalibrationCost['unconservative'][number] | null
}

/** The part of `costOfConservatism` that depends on one project alone. */
export function costOfProject(p: CostProjectInput): ProjectCost {
  const cmax: number[] = []
  let unconservativeBraces = 0
  let worst: { quantity: 'tmax' | 'cmax'; ratio: number } | null = null
  const n = Math.max(p.tmaxRatios.length, p.cmaxRatios.length)
  for (let i = 0; i < n; i++) {
    const t = p.tmaxRatios[i] ?? NaN
    const c = p.cmaxRatios[i] ?? NaN
    if (Number.isFinite(c)) cmax.push(c)
    if (t < 1 || c < 1) unconservativeBraces++
    if (t < 1 && (!worst || t < worst.ratio)) worst = { quantity: 'tmax', ratio: t }
    if (c < 1 && (!worst || c < worst.ratio)) worst = { quantity: 'cmax', ratio: c }
  }
  const unconservative = worst ? { code: p.code, name: p.name, braces: unconservativeBraces, worstQuantity: worst.quantity, worstRatio: worst.ratio } : null
  if (!cmax.length) return { project: null, unconservative }
  const conservatism = quantileOfSorted(sortedCopy(cmax), 0.5)
  const capacity = capacityDesignedTons(p.final)
  return {
    project: {
      code: p.code,
      name: p.name,
      yearDesigned: p.yearDesigned,
      conservatism,
      preliminaryLateralTons: lateralTons(p.preliminary),
      finalLateralTons: lateralTons(p.final),
      attributableTons: capacity === null ? 0 : attributableTons(capacity, conservatism),
      unconservativeBraces,
      braces: cmax.length,
    },
    unconservative,
  }
}

/** The answer from the projects' parts, in project order. */
export function costTotals(parts: ProjectCost[]): CalibrationCost {
  const projects: CalibrationCost['projects'] = []
  const unconservative: CalibrationCost['unconservative'] = []
  for (const part of parts) {
    if (part.unconservative) unconservative.push({ ...part.unconservative })
    if (part.project) projects.push({ ...part.project })
  }
  const finalLateral = projects.reduce((s, p) => s + (p.finalLateralTons ?? 0), 0)
  const attributable = projects.reduce((s, p) => s + p.attributableTons, 0)
  unconservative.sort((a, b) => a.worstRatio - b.worstRatio || a.code.localeCompare(b.code))
  return {
    method: COST_METHOD,
    projects,
    totals: { projects: projects.length, finalLateralTons: finalLateral, attributableTons: attributable, attributableShare: finalLateral > 0 ? attributable / finalLateral : 0 },
    unconservative,
  }
}

/** The steel cost of conservatism per project and in total, and the projects with unconservative braces. */
export function costOfConservatism(inputs: CostProjectInput[]): CalibrationCost {
  return costTotals(inputs.map(costOfProject))
}
