import { KN_PER_KIP, MM_PER_IN } from './constants'

/**
 * Axial stiffness conversions. Canonical stiffness is kip/in (`…KipPerIn`).
 * 1 kip/in = 4.4482216152605 kN / 25.4 mm = 0.17512683524648 kN/mm (derived from the exact bases).
 */

/** kN/mm per kip/in, derived. */
export const KN_PER_MM_PER_KIP_PER_IN = KN_PER_KIP / MM_PER_IN

/** kip/in → kN/mm (× 0.175126835…). */
export const kipPerInToKnPerMm = (stiffnessKipPerIn: number): number => stiffnessKipPerIn * KN_PER_MM_PER_KIP_PER_IN

/** kN/mm → kip/in (÷ 0.175126835…). */
export const knPerMmToKipPerIn = (stiffnessKnPerMm: number): number => stiffnessKnPerMm / KN_PER_MM_PER_KIP_PER_IN
