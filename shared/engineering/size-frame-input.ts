import { UNIT_SYSTEMS, type UnitSystem } from '../units/systems'
import { findStepBandIssues, DESIGN_METHODS, type DesignMethod } from './core-size'
import { isFiniteNumber, mustBe, type InputIssue } from './errors'
import { BRACE_CONFIGURATIONS, type BraceConfiguration } from './geometry'

/**
 * The request of `sizeFrame` (the `POST /api/sizing/frame` body) and its validation.
 * All numbers are in the request's unit system (see `DISPLAY_UNITS`):
 * US — ft for bayWidth and storyHeight, kip for storyShear, ksi for stresses, in² for areas;
 * SI — m, kN, MPa, mm².
 */

/** One story of the frame line, bottom story first. */
export interface SizeFrameLevelInput {
  /** Label shown back in the result, e.g. "L2". */
  name: string
  /** Floor-to-floor height of this story, ft | m. */
  storyHeight: number
  /** Shear carried by this frame line at this story, kip | kN: factored (LRFD) or service-level (ASD). */
  storyShear: number
}

/** Capacity basis as sent in a request (stresses in ksi | MPa). See `CapacityBasis`. */
export type SizeFrameCapacityBasis =
  | { kind: 'ry'; ry: number }
  | { kind: 'yieldRange'; fyscMax: number }
  | { kind: 'coupon'; fysc: number }

/** One band of a core-increment table as sent in a request, areas in in² | mm². See `CoreStepBand`. */
export interface CoreStepInput {
  upTo: number | null
  step: number
}

/** Input of `sizeFrame`. Optional fields take `SIZE_FRAME_DEFAULTS`. */
export interface SizeFrameRequest {
  units: UnitSystem
  method: DesignMethod
  configuration: BraceConfiguration
  /** Column-to-column bay width, ft | m. */
  bayWidth: number
  /** Braced bays in the frame line sharing the story shear (1–20). Default 1. */
  bracedBays?: number
  /** Stories, bottom first (1–60). */
  levels: SizeFrameLevelInput[]
  /** Specified minimum core yield stress, ksi | MPa (used for sizing and the design check). */
  fyscMin: number
  capacityBasis: SizeFrameCapacityBasis
  /** Compression adjustment factor β. */
  beta: number
  /** Strain-hardening adjustment factor ω. */
  omega: number
  /** Stiffness modification factor KF. Default 1.4. */
  stiffnessFactor?: number
  /** Yielding length over work-point length, Ly/Lwp. Default 0.6. */
  yieldLengthRatio?: number
  /** Core-increment table in the request's area unit. Default: `DEFAULT_CORE_STEPS` (in²). */
  coreSteps?: CoreStepInput[] | null
}

/**
 * Defaults of the optional request fields: one braced bay; KF = 1.4 and Ly/Lwp = 0.6, the middle
 * of the usual preliminary assumptions (KF 1.3–1.5, Ly/Lwp ≈ 0.6: BRB literature ranges,
 * engineering reference §5, from memory; common practice).
 */
export const SIZE_FRAME_DEFAULTS = Object.freeze({ bracedBays: 1, stiffnessFactor: 1.4, yieldLengthRatio: 0.6 })

/** Size limits of a request: 1–60 levels, 1–20 braced bays, level names up to 80 characters. */
export const SIZE_FRAME_LIMITS = Object.freeze({ maxLevels: 60, maxBracedBays: 20, maxNameLength: 80 })

const isObject = (value: unknown): value is Record<string, unknown> =>
  typeof value === 'object' && value !== null && !Array.isArray(value)

const oneOf = (list: readonly string[]) => `one of ${list.map((v) => `'${v}'`).join(', ')}`

/**
 * Every problem with a `sizeFrame` request, each with its dotted field path
 * (e.g. `levels.2.storyHeight`). Returns [] for a valid request. Used by `sizeFrame`,
 * which throws `EngineeringInputError` carrying these issues.
 */
export function findSizeFrameIssues(request: unknown): InputIssue[] {
  if (!isObject(request)) return [{ field: '', message: 'the request must be a JSON object.' }]
  const issues: InputIssue[] = []
  const add = (field: string, message: string) => issues.push({ field, message })
  const u = request.units === 'si' ? { dim: 'm', force: 'kN', stress: 'MPa', area: 'mm²' } : { dim: 'ft', force: 'kip', stress: 'ksi', area: 'in²' }
  const positive = (value: unknown, field: string, hint: string) => {
    if (!isFiniteNumber(value) || value <= 0) add(field, mustBe('a finite number greater than 0', value, hint))
  }

  if (!(UNIT_SYSTEMS as readonly unknown[]).includes(request.units)) add('units', mustBe(oneOf(UNIT_SYSTEMS), request.units, "'us' or 'si'"))
  if (!(DESIGN_METHODS as readonly unknown[]).includes(request.method)) add('method', mustBe(oneOf(DESIGN_METHODS), request.method, "'lrfd' or 'asd'"))
  if (!(BRACE_CONFIGURATIONS as readonly unknown[]).includes(request.configuration)) {
    add('configuration', mustBe(oneOf(BRACE_CONFIGURATIONS), request.configuration, 'a brace configuration'))
  }
  positive(request.bayWidth, 'bayWidth', `the column-to-column bay width in ${u.dim}`)
  if (request.bracedBays !== undefined) {
    const n = request.bracedBays
    if (!Number.isInteger(n) || (n as number) < 1 || (n as number) > SIZE_FRAME_LIMITS.maxBracedBays) {
      add('bracedBays', mustBe(`a whole number from 1 to ${SIZE_FRAME_LIMITS.maxBracedBays}`, n, 'the number of braced bays in this frame line'))
    }
  }
  checkLevels(request.levels, u, add, positive)
  positive(request.fyscMin, 'fyscMin', `the specified minimum core yield stress in ${u.stress}`)
  checkCapacityBasis(request.capacityBasis, request.fyscMin, u.stress, add, positive)
  positive(request.beta, 'beta', 'β from the supplier’s qualification tests (typically 1.0–1.3)')
  positive(request.omega, 'omega', 'ω from the supplier’s qualification tests (typically 1.2–1.5)')
  if (request.stiffnessFactor !== undefined) positive(request.stiffnessFactor, 'stiffnessFactor', 'KF (typically 1.2–1.7)')
  if (request.yieldLengthRatio !== undefined) {
    const r = request.yieldLengthRatio
    if (!isFiniteNumber(r) || r <= 0 || r > 1) add('yieldLengthRatio', mustBe('greater than 0 and at most 1', r, 'Ly/Lwp (typically 0.5–0.7)'))
  }
  if (request.coreSteps !== undefined && request.coreSteps !== null) {
    issues.push(...findStepBandIssues(request.coreSteps as CoreStepInput[], 'coreSteps'))
  }
  return issues
}

type Add = (field: string, message: string) => void
type Positive = (value: unknown, field: string, hint: string) => void

function checkLevels(levels: unknown, u: { dim: string; force: string }, add: Add, positive: Positive): void {
  const { maxLevels, maxNameLength } = SIZE_FRAME_LIMITS
  if (!Array.isArray(levels) || levels.length < 1 || levels.length > maxLevels) {
    add('levels', `must list from 1 to ${maxLevels} stories, bottom story first.`)
    return
  }
  levels.forEach((level: unknown, i) => {
    if (!isObject(level)) return add(`levels.${i}`, 'must be an object { name, storyHeight, storyShear }.')
    const { name } = level
    if (typeof name !== 'string' || name.trim().length === 0 || name.length > maxNameLength) {
      add(`levels.${i}.name`, `must be a non-empty label of at most ${maxNameLength} characters.`)
    }
    positive(level.storyHeight, `levels.${i}.storyHeight`, `the floor-to-floor story height in ${u.dim}`)
    positive(level.storyShear, `levels.${i}.storyShear`, `the story shear carried by this frame line in ${u.force}`)
  })
}

function checkCapacityBasis(basis: unknown, fyscMin: unknown, stress: string, add: Add, positive: Positive): void {
  if (!isObject(basis)) return add('capacityBasis', "must be { kind: 'ry', ry } or { kind: 'yieldRange', fyscMax } or { kind: 'coupon', fysc }.")
  switch (basis.kind) {
    case 'ry':
      return positive(basis.ry, 'capacityBasis.ry', 'Ry from AISC 341 Table A3.1 (1.3 for A36 plate)')
    case 'yieldRange':
      positive(basis.fyscMax, 'capacityBasis.fyscMax', `the upper bound of the ordered core yield window in ${stress}`)
      if (isFiniteNumber(basis.fyscMax) && isFiniteNumber(fyscMin) && basis.fyscMax < fyscMin) {
        add('capacityBasis.fyscMax', mustBe(`at least fyscMin (${fyscMin})`, basis.fyscMax, `the upper bound of the yield window in ${stress}`))
      }
      return
    case 'coupon':
      return positive(basis.fysc, 'capacityBasis.fysc', `the yield stress measured on core coupons in ${stress}`)
    default:
      add('capacityBasis.kind', mustBe(oneOf(['ry', 'yieldRange', 'coupon']), basis.kind, 'how the expected core yield is obtained'))
  }
}
