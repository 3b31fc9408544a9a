import { KN_PER_KIP } from './constants'

/**
 * Force conversions. Canonical force is the kip (1000 lbf, `…Kip`).
 * 1 kip = 4.4482216152605 kN, derived from 1 lb = 0.45359237 kg and g = 9.80665 m/s²
 * (NIST SP 811 App. B: 1 kip = 4.448 222 E+03 N).
 */

/** Kips → kilonewtons (× 4.4482216152605). */
export const kipToKn = (forceKip: number): number => forceKip * KN_PER_KIP

/** Kilonewtons → kips (÷ 4.4482216152605). */
export const knToKip = (forceKn: number): number => forceKn / KN_PER_KIP
