import { KG_PER_LB, KG_PER_TONNE, LB_PER_SHORT_TON, M_PER_FT } from './constants'

/**
 * Weight (mass) conversions. Canonical weight is the pound mass (`…Lb`); steel
 * "weight" in Backsight always means mass, as in tonnage take-offs.
 * Factors derived from 1 lb = 0.45359237 kg and 1 ft = 0.3048 m (NIST SP 811 App. B).
 */

/** kg/m² per lb/ft², derived: 0.45359237 / 0.3048² = 4.882427636. */
export const KG_PER_M2_PER_LB_PER_FT2 = KG_PER_LB / (M_PER_FT * M_PER_FT)

/** kg/m³ per lb/ft³, derived: 0.45359237 / 0.3048³ = 16.01846337. */
export const KG_PER_M3_PER_LB_PER_FT3 = KG_PER_LB / (M_PER_FT * M_PER_FT * M_PER_FT)

/** kg/m per lb/ft, derived: 0.45359237 / 0.3048 = 1.488163944. */
export const KG_PER_M_PER_LB_PER_FT = KG_PER_LB / M_PER_FT

/** Pounds → kilograms (× 0.45359237, exact). */
export const lbToKg = (weightLb: number): number => weightLb * KG_PER_LB

/** Kilograms → pounds (÷ 0.45359237, exact). */
export const kgToLb = (weightKg: number): number => weightKg / KG_PER_LB

/** Short tons (2000 lb) → tonnes (1000 kg): × 0.90718474, exact. */
export const shortTonToTonne = (weightShortTon: number): number =>
  (weightShortTon * LB_PER_SHORT_TON * KG_PER_LB) / KG_PER_TONNE

/** Tonnes → short tons: ÷ 0.90718474, exact. */
export const tonneToShortTon = (weightTonne: number): number =>
  (weightTonne * KG_PER_TONNE) / (LB_PER_SHORT_TON * KG_PER_LB)

/** lb/ft² → kg/m² (× 4.882427636), e.g. steel tonnage per floor area. */
export const lbPerFt2ToKgPerM2 = (value: number): number => value * KG_PER_M2_PER_LB_PER_FT2

/** kg/m² → lb/ft² (÷ 4.882427636). */
export const kgPerM2ToLbPerFt2 = (value: number): number => value / KG_PER_M2_PER_LB_PER_FT2

/** lb/ft³ → kg/m³ (× 16.01846337), e.g. steel density 490 lb/ft³ = 7849.0 kg/m³. */
export const lbPerFt3ToKgPerM3 = (value: number): number => value * KG_PER_M3_PER_LB_PER_FT3

/** kg/m³ → lb/ft³ (÷ 16.01846337). */
export const kgPerM3ToLbPerFt3 = (value: number): number => value / KG_PER_M3_PER_LB_PER_FT3

/** lb/ft → kg/m (× 1.488163944), e.g. member weight per length. */
export const lbPerFtToKgPerM = (value: number): number => value * KG_PER_M_PER_LB_PER_FT

/** kg/m → lb/ft (÷ 1.488163944). */
export const kgPerMToLbPerFt = (value: number): number => value / KG_PER_M_PER_LB_PER_FT
