import { KN_PER_KIP, MM_PER_IN } from './constants'

/**
 * Stress conversions. Canonical stress is the ksi (kip/in², `…Ksi`).
 * 1 ksi = 4448.2216152605 N / 645.16 mm² = 6.894757293168 MPa
 * (NIST SP 811 App. B: 6.894 757 E+06 Pa).
 */

/** MPa (N/mm²) per ksi, derived: 1000 × 4.4482216152605 / 25.4². */
export const MPA_PER_KSI = (KN_PER_KIP * 1000) / (MM_PER_IN * MM_PER_IN)

/** ksi → MPa (× 6.894757293168). */
export const ksiToMpa = (stressKsi: number): number => stressKsi * MPA_PER_KSI

/** MPa → ksi (÷ 6.894757293168). */
export const mpaToKsi = (stressMpa: number): number => stressMpa / MPA_PER_KSI
