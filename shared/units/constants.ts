/**
 * Exact bases of the US customary ↔ SI conversions.
 *
 * Source: the 1959 international yard and pound agreement (1 ft = 0.3048 m and
 * 1 lb = 0.45359237 kg, both exact) and standard gravity g = 9.80665 m/s² (exact),
 * as used by NIST SP 811 (2008) Appendix B. Every other factor in `shared/units`
 * is derived from these by arithmetic, never typed in as a rounded decimal.
 */

/** Metres per foot, exact (international foot). */
export const M_PER_FT = 0.3048

/** Millimetres per inch, exact (= 0.3048 m / 12 × 1000). */
export const MM_PER_IN = 25.4

/** Inches per foot, exact. */
export const IN_PER_FT = 12

/** Kilograms per pound (avoirdupois, mass), exact. */
export const KG_PER_LB = 0.45359237

/** Standard acceleration of gravity in m/s², exact. */
export const STANDARD_GRAVITY_M_PER_S2 = 9.80665

/** Newtons per pound-force: 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N (exact product). */
export const N_PER_LBF = KG_PER_LB * STANDARD_GRAVITY_M_PER_S2

/** Kilonewtons per kip (1 kip = 1000 lbf): 4.4482216152605 kN. */
export const KN_PER_KIP = N_PER_LBF

/** Pounds per short ton, exact. */
export const LB_PER_SHORT_TON = 2000

/** Kilograms per tonne (metric ton), exact. */
export const KG_PER_TONNE = 1000
