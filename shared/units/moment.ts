import { KN_PER_KIP, M_PER_FT } from './constants'

/**
 * Moment conversions. Canonical moment is kip·in (`…KipIn`); kip·ft (`…KipFt`) and
 * kN·m (`…KnM`) are display units. 1 kip·ft = 4.4482216152605 kN × 0.3048 m
 * = 1.3558179483 kN·m (NIST SP 811 App. B: 1.355 818 E+03 N·m).
 */

/** kN·m per kip·ft, derived. */
export const KN_M_PER_KIP_FT = KN_PER_KIP * M_PER_FT

/** kip·ft → kN·m (× 1.3558179483). */
export const kipFtToKnM = (momentKipFt: number): number => momentKipFt * KN_M_PER_KIP_FT

/** kN·m → kip·ft (÷ 1.3558179483). */
export const knMToKipFt = (momentKnM: number): number => momentKnM / KN_M_PER_KIP_FT

/** kip·in → kip·ft (÷ 12). */
export const kipInToKipFt = (momentKipIn: number): number => momentKipIn / 12

/** kip·ft → kip·in (× 12). */
export const kipFtToKipIn = (momentKipFt: number): number => momentKipFt * 12
