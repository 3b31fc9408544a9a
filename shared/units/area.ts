import { MM_PER_IN } from './constants'

/**
 * Area conversions. Canonical area is the square inch (`…In2`).
 * 1 in² = 645.16 mm² exactly (NIST SP 811 App. B: 6.4516 E−04 m²).
 */

/** mm² per in², exact (25.4²). */
export const MM2_PER_IN2 = MM_PER_IN * MM_PER_IN

/** in² → mm² (× 645.16, exact). */
export const in2ToMm2 = (areaIn2: number): number => areaIn2 * MM2_PER_IN2

/** mm² → in² (÷ 645.16, exact). */
export const mm2ToIn2 = (areaMm2: number): number => areaMm2 / MM2_PER_IN2
