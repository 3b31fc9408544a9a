import { IN_PER_FT, MM_PER_IN, M_PER_FT } from './constants'

/**
 * Length conversions. Canonical length inside Backsight is the inch (`…In`);
 * feet (`…Ft`) are used for frame dimensions on screen and in US requests.
 * Factors are exact (NIST SP 811 App. B: 1 in = 2.54 E−02 m, 1 ft = 3.048 E−01 m).
 */

/** Inches → millimetres (× 25.4, exact). */
export const inToMm = (lengthIn: number): number => lengthIn * MM_PER_IN

/** Millimetres → inches (÷ 25.4, exact). */
export const mmToIn = (lengthMm: number): number => lengthMm / MM_PER_IN

/** Feet → metres (× 0.3048, exact). */
export const ftToM = (lengthFt: number): number => lengthFt * M_PER_FT

/** Metres → feet (÷ 0.3048, exact). */
export const mToFt = (lengthM: number): number => lengthM / M_PER_FT

/** Feet → inches (× 12). */
export const ftToIn = (lengthFt: number): number => lengthFt * IN_PER_FT

/** Inches → feet (÷ 12). */
export const inToFt = (lengthIn: number): number => lengthIn / IN_PER_FT

/** Metres → inches (÷ 0.0254). */
export const mToIn = (lengthM: number): number => (lengthM * 1000) / MM_PER_IN

/** Inches → metres (× 0.0254). */
export const inToM = (lengthIn: number): number => (lengthIn * MM_PER_IN) / 1000
