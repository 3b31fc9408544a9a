/**
 * ASCE 7-16 §12.8 equivalent lateral force (ELF) procedure, reduced to what the demo-firm
 * generator needs: approximate period, seismic response coefficient, base shear, vertical
 * distribution and story shears. Units: ft for heights, kip for weights and forces, s, g.
 *
 * The BRBF period coefficients Ct = 0.03 (ft) and x = 0.75 (Table 12.8-2, "eccentrically braced
 * and buckling-restrained braced frames") are partly verified (engineering reference §2 [P]); the
 * Cs equations and the k exponent are from memory of ASCE 7-16 §12.8.1.1 and §12.8.3.
 */

/** Ct for BRBF in ft units, ASCE 7-16 Table 12.8-2 (partly verified, engineering reference §2). */
export const BRBF_PERIOD_CT = 0.03
/** x for BRBF, ASCE 7-16 Table 12.8-2 (partly verified, engineering reference §2). */
export const BRBF_PERIOD_X = 0.75

/** Approximate fundamental period Ta = Ct · hn^x, s, hn in ft (ASCE 7-16 §12.8.2.1, Eq. 12.8-7). */
export function approximatePeriod(hnFt: number, ct = BRBF_PERIOD_CT, x = BRBF_PERIOD_X): number {
  if (!(hnFt > 0)) throw new RangeError(`hnFt must be > 0 (got ${hnFt}).`)
  return ct * hnFt ** x
}

/** Inputs of `seismicResponseCoefficient`. Accelerations in g, period in s. */
export interface CsInput {
  sds: number
  sd1: number
  /** Mapped 1-s spectral acceleration S1, g (only for the S1 ≥ 0.6 g floor, Eq. 12.8-6). */
  s1: number
  r: number
  ie: number
  periodS: number
  /** Long-period transition period TL, s (ASCE 7-16 §11.4.6, Figures 22-14 to 22-17). */
  tlS: number
}

/**
 * Seismic response coefficient Cs (ASCE 7-16 §12.8.1.1, from memory):
 * Cs = SDS/(R/Ie) (Eq. 12.8-2), at most SD1/(T·R/Ie) for T ≤ TL (12.8-3) or SD1·TL/(T²·R/Ie) above
 * (12.8-4), at least max(0.044·SDS·Ie, 0.01) (12.8-5) and, where S1 ≥ 0.6 g, at least 0.5·S1/(R/Ie) (12.8-6).
 */
export function seismicResponseCoefficient(input: CsInput): number {
  const { sds, sd1, s1, r, ie, periodS: t, tlS } = input
  const rOverIe = r / ie
  const upper = t <= tlS ? sd1 / (t * rOverIe) : (sd1 * tlS) / (t * t * rOverIe)
  let cs = Math.min(sds / rOverIe, upper)
  cs = Math.max(cs, 0.044 * sds * ie, 0.01)
  if (s1 >= 0.6) cs = Math.max(cs, (0.5 * s1) / rOverIe)
  return cs
}

/** Distribution exponent k: 1 for T ≤ 0.5 s, 2 for T ≥ 2.5 s, linear between (ASCE 7-16 §12.8.3). */
export function distributionExponent(periodS: number): number {
  if (periodS <= 0.5) return 1
  if (periodS >= 2.5) return 2
  return 1 + (periodS - 0.5) / 2
}

/**
 * Lateral forces Fx = Cvx · V with Cvx = wx·hx^k / Σ wi·hi^k (ASCE 7-16 §12.8.3, Eqs. 12.8-11, 12.8-12).
 * `weightsKip[i]` is the seismic weight at the floor above story i (bottom first) and `heightsFt[i]`
 * its height above the base. Returns the forces in the same order.
 */
export function verticalDistribution(weightsKip: readonly number[], heightsFt: readonly number[], baseShearKip: number, k: number): number[] {
  if (weightsKip.length !== heightsFt.length || weightsKip.length === 0) throw new RangeError('weights and heights must be non-empty and of equal length.')
  const terms = weightsKip.map((w, i) => w * heightsFt[i]! ** k)
  const sum = terms.reduce((a, b) => a + b, 0)
  return terms.map((term) => (term / sum) * baseShearKip)
}

/** Story shears Vx = Σ Fi over the floors at and above the top of story x (ASCE 7-16 §12.8.4), bottom story first. */
export function storyShears(forcesKip: readonly number[]): number[] {
  const shears = new Array<number>(forcesKip.length)
  let running = 0
  for (let i = forcesKip.length - 1; i >= 0; i--) {
    running += forcesKip[i]!
    shears[i] = running
  }
  return shears
}

/** Result of `computeElf`. */
export interface ElfResult {
  heightFt: number
  periodS: number
  cs: number
  seismicWeightKip: number
  baseShearKip: number
  k: number
  /** Fx at the floor above each story, bottom story first, kip. */
  forcesKip: number[]
  /** Vx of each story, bottom story first, kip (whole building, one direction). */
  storyShearsKip: number[]
}

/**
 * The whole ELF chain for one direction: Ta from the roof height, Cs, V = Cs·W (Eq. 12.8-1),
 * Fx and Vx. The approximate period Ta is used directly (the Cu·Ta cap on a computed period is
 * not modelled: Ta is the lower, conservative choice).
 */
export function computeElf(input: {
  storyHeightsFt: readonly number[]
  floorWeightsKip: readonly number[]
  sds: number
  sd1: number
  s1: number
  r: number
  ie: number
  tlS: number
}): ElfResult {
  const heightsFt: number[] = []
  let h = 0
  for (const storyHeight of input.storyHeightsFt) heightsFt.push((h += storyHeight))
  const periodS = approximatePeriod(h)
  const cs = seismicResponseCoefficient({ ...input, periodS })
  const seismicWeightKip = input.floorWeightsKip.reduce((a, b) => a + b, 0)
  const baseShearKip = cs * seismicWeightKip
  const k = distributionExponent(periodS)
  const forcesKip = verticalDistribution(input.floorWeightsKip, heightsFt, baseShearKip, k)
  return { heightFt: h, periodS, cs, seismicWeightKip, baseShearKip, k, forcesKip, storyShearsKip: storyShears(forcesKip) }
}
