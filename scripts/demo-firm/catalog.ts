import type { CoreStepBand } from '@shared/engineering/core-size'
import type { Asce7Edition } from '@shared/engineering/code-tables'

/**
 * Fixed vocabulary of the invented demo firm: offices, suppliers and their factor habits, building
 * uses, name words, code editions by year and the firm's own assumed (sd) factors by era.
 * Everything here is fictitious: no real firm, client, supplier, city or street.
 */

/** "Data as of" date of the export: no snapshot is dated later. */
export const CUTOFF_DATE = '2026-06-30'
/** Last year a project can be completed by. */
export const CUTOFF_YEAR = 2026

export type Office = 'North' | 'South' | 'Coast'
export const OFFICE_PREFIX: Record<Office, string> = { North: 'NO', South: 'SO', Coast: 'CO' }
/** Office region and seismicity mix: weights of moderate (SDC C), high (SDC D) and near-fault (SDC E/F) sites. */
export const OFFICE_SITES: Record<Office, { region: string; otherRegion: string; zones: readonly [Zone, number][] }> = {
  North: { region: 'Region 1', otherRegion: 'Region 2', zones: [['moderate', 0.25], ['high', 0.62], ['near_fault', 0.13]] },
  South: { region: 'Region 2', otherRegion: 'Region 1', zones: [['moderate', 0.42], ['high', 0.5], ['near_fault', 0.08]] },
  Coast: { region: 'Region 3', otherRegion: 'Region 2', zones: [['moderate', 0.06], ['high', 0.6], ['near_fault', 0.34]] },
}
export type Zone = 'moderate' | 'high' | 'near_fault'

export type BuildingUse = 'office' | 'laboratory' | 'healthcare' | 'school' | 'residential' | 'parking' | 'industrial' | 'mixed'

/** Per use: weight in the mix, stories range, typical story height (ft), floor dead load for seismic weight (psf), gravity steel (psf). */
export const USES: Record<BuildingUse, { weight: number; stories: readonly [number, number]; typicalStoryFt: readonly [number, number]; seismicPsf: number; gravityPsf: number; suffixes: readonly string[] }> = {
  office: { weight: 30, stories: [2, 20], typicalStoryFt: [13, 14], seismicPsf: 100, gravityPsf: 6.4, suffixes: ['Offices', 'Office Building', 'Corporate Center'] },
  laboratory: { weight: 12, stories: [3, 8], typicalStoryFt: [15, 17], seismicPsf: 115, gravityPsf: 7.8, suffixes: ['Research Center', 'Laboratory Building', 'Science Hall'] },
  healthcare: { weight: 12, stories: [3, 12], typicalStoryFt: [14, 16], seismicPsf: 115, gravityPsf: 7.4, suffixes: ['Medical Pavilion', 'Clinic', 'Care Center'] },
  school: { weight: 10, stories: [2, 4], typicalStoryFt: [13.5, 15], seismicPsf: 100, gravityPsf: 6.4, suffixes: ['Learning Center', 'Classroom Building', 'Academy'] },
  residential: { weight: 12, stories: [4, 20], typicalStoryFt: [12, 12.5], seismicPsf: 90, gravityPsf: 5.6, suffixes: ['Apartments', 'Residences', 'Lofts'] },
  parking: { weight: 7, stories: [2, 6], typicalStoryFt: [12, 12], seismicPsf: 130, gravityPsf: 7.6, suffixes: ['Parking Structure', 'Garage'] },
  industrial: { weight: 6, stories: [2, 3], typicalStoryFt: [16, 18], seismicPsf: 105, gravityPsf: 7.0, suffixes: ['Distribution Hall', 'Process Building', 'Workshop'] },
  mixed: { weight: 11, stories: [4, 16], typicalStoryFt: [12.5, 13], seismicPsf: 100, gravityPsf: 6.2, suffixes: ['Mixed-Use', 'Commons', 'Exchange'] },
}

/** Neutral first words of project names (no places). */
export const NAME_WORDS = [
  'Harbor Terrace', 'Cedar Court', 'Maple Court', 'Ridgeline', 'Willow Walk', 'Saffron', 'Primrose', 'Lumen', 'Granite Yard',
  'Orchard', 'Birchwood', 'Aspen Place', 'Juniper', 'Falcon Court', 'Indigo', 'Linden Square', 'Heron Walk', 'Copperleaf', 'Sandstone',
  'Alder Gate', 'Briarwood', 'Clover Park', 'Elm Walk', 'Fernhill', 'Hawthorn', 'Ivy Court', 'Larch', 'Marigold', 'Oak Terrace',
  'Pine Court', 'Quarry Point', 'Sparrow', 'Thistle', 'Green Hollow', 'Wren Court', 'Bluebell', 'Foxglove', 'Kestrel', 'Mossgate',
  'North Star', 'Verdant', 'Silverleaf', 'Silver Fern', 'First Light', 'Quartz', 'Timberline', 'Westwind', 'Obsidian', 'Highmeadow',
  'Cobalt', 'Amberly', 'Blue Heron', 'Crescent', 'Driftwood', 'Cinder', 'Amber Leaf', 'Goldfinch', 'Hollybrook', 'Lantern',
] as const

/** One invented brace supplier and its factor habits at 2.0 × design story drift (literature ranges, engineering reference §5). */
export interface SupplierProfile {
  code: string
  displayName: string
  notes: string
  /** Years the firm saw this supplier. */
  firstYear: number
  /** ω and β at 2 % core strain, their change per 1 % of core strain, and scatter (sd). */
  omega2: number
  omegaSlope: number
  omegaSd: number
  beta2: number
  betaSlope: number
  betaSd: number
  /** Mean KF and Ly/Lwp of the supplier's braces. */
  stiffnessFactor: number
  yieldLengthRatio: number
  /** Ordered core plate yield window, ksi. */
  fyscMin: number
  fyscMax: number
  /** Mean and scatter of coupon yield stress, ksi. */
  couponMean: number
  couponSd: number
  /** Core-area increments of the supplier's plates. */
  steps: readonly CoreStepBand[]
  /** Actual brace weight over 490·Asc·Lwp/1728 (casing and ends), for final tonnage. */
  braceWeightRatio: number
}

/** Firm minimum core of 2.0 in², then the engine's default increments (common practice, no source). */
export const FIRM_CORE_STEPS: readonly CoreStepBand[] = [
  { upToIn2: 2, stepIn2: 2 },
  { upToIn2: 5, stepIn2: 0.25 },
  { upToIn2: 10, stepIn2: 0.5 },
  { upToIn2: null, stepIn2: 1 },
]
/** Same minimum, coarser 0.5 in² plate steps up to 12 in² (an invented supplier habit). */
const HALF_STEPS: readonly CoreStepBand[] = [
  { upToIn2: 2, stepIn2: 2 },
  { upToIn2: 12, stepIn2: 0.5 },
  { upToIn2: null, stepIn2: 1 },
]

export const SUPPLIERS: readonly SupplierProfile[] = [
  {
    code: 'SUP-A', displayName: 'Quillmark Brace Works', firstYear: 2008,
    notes: 'Invented demo supplier. Higher strain hardening (ω) than the others; bolted ends.',
    omega2: 1.52, omegaSlope: 0.08, omegaSd: 0.025, beta2: 1.05, betaSlope: 0.02, betaSd: 0.015,
    stiffnessFactor: 1.36, yieldLengthRatio: 0.63, fyscMin: 38, fyscMax: 46, couponMean: 42.6, couponSd: 1.6,
    steps: FIRM_CORE_STEPS, braceWeightRatio: 2.3,
  },
  {
    code: 'SUP-B', displayName: 'Fenmoor Axial Systems', firstYear: 2008,
    notes: 'Invented demo supplier. Compression adjustment β near 1.2; pinned ends; 0.5 in² plate steps.',
    omega2: 1.36, omegaSlope: 0.06, omegaSd: 0.02, beta2: 1.19, betaSlope: 0.025, betaSd: 0.015,
    stiffnessFactor: 1.42, yieldLengthRatio: 0.6, fyscMin: 38, fyscMax: 46, couponMean: 41.4, couponSd: 1.4,
    steps: HALF_STEPS, braceWeightRatio: 2.7,
  },
  {
    code: 'SUP-C', displayName: 'Orrin Yield Devices', firstYear: 2010,
    notes: 'Invented demo supplier. Short yielding zones, so stiffer braces (KF about 1.6); 40–48 ksi core plate.',
    omega2: 1.41, omegaSlope: 0.07, omegaSd: 0.02, beta2: 1.1, betaSlope: 0.02, betaSd: 0.015,
    stiffnessFactor: 1.6, yieldLengthRatio: 0.5, fyscMin: 40, fyscMax: 48, couponMean: 44.8, couponSd: 1.5,
    steps: FIRM_CORE_STEPS, braceWeightRatio: 2.4,
  },
  {
    code: 'SUP-D', displayName: 'Tallowgate Seismic Products', firstYear: 2013,
    notes: 'Invented demo supplier. Middle of the range on every factor; welded ends.',
    omega2: 1.39, omegaSlope: 0.06, omegaSd: 0.02, beta2: 1.09, betaSlope: 0.02, betaSd: 0.012,
    stiffnessFactor: 1.46, yieldLengthRatio: 0.58, fyscMin: 38, fyscMax: 46, couponMean: 42.0, couponSd: 1.3,
    steps: FIRM_CORE_STEPS, braceWeightRatio: 2.6,
  },
]

/** Code editions by year designed (ASCE 7-05 to ~2011, 7-10 to ~2017, 7-16 after, a few 7-22 from 2024). */
export function editionsFor(year: number, u: number): { asce7: Asce7Edition; aisc341: string } {
  if (year <= 2010 || (year === 2011 && u < 0.5)) return { asce7: '7-05', aisc341: '341-05' }
  if (year <= 2016 || (year === 2017 && u < 0.5)) return { asce7: '7-10', aisc341: '341-10' }
  if (year >= 2024 && u < (year - 2023) * 0.2) return { asce7: '7-22', aisc341: '341-22' }
  return { asce7: '7-16', aisc341: '341-16' }
}

/** The firm's assumed (sd) factors: a preliminary "snapshot" of its habits in that era and office. */
export interface FirmAssumption {
  beta: number
  omega: number
  fyscMin: number
  basis: 'specified_min' | 'yield_range'
  /** Ry (specified_min) or the upper bound of the yield window (yield_range). */
  ry: number | null
  fyscMax: number | null
  stiffnessFactor: number
  yieldLengthRatio: number
}

/**
 * Era habits (common practice, no source): up to 2013 Fysc = 36 ksi A36 plate with Ry = 1.3
 * (AISC 341 Table A3.1 plate row, from memory); from 2014 a 38–46 ksi ordered window. β 1.10–1.15,
 * ω 1.30–1.40, KF 1.3–1.5, Ly/Lwp 0.6 (engineering reference §5 common preliminary assumptions).
 */
export function firmAssumption(year: number, office: Office, u: number): FirmAssumption {
  const early = year <= 2013
  const base = early
    ? { fyscMin: 36, basis: 'specified_min' as const, ry: 1.3, fyscMax: null }
    : { fyscMin: 38, basis: 'yield_range' as const, ry: 1, fyscMax: 46 }
  const habits: Record<Office, [number, number, number][]> = {
    // [β, ω, KF] options; later years lean conservative after the early submittals came in high.
    North: early ? [[1.1, 1.3, 1.4], [1.1, 1.35, 1.4]] : [[1.15, 1.4, 1.4], [1.1, 1.35, 1.5]],
    South: early ? [[1.15, 1.35, 1.3], [1.1, 1.3, 1.3]] : [[1.1, 1.35, 1.4], [1.15, 1.4, 1.4]],
    Coast: early ? [[1.1, 1.4, 1.5], [1.12, 1.35, 1.5]] : [[1.1, 1.4, 1.5], [1.15, 1.4, 1.5]],
  }
  const options = habits[office]
  const [beta, omega, stiffnessFactor] = options[Math.min(options.length - 1, Math.floor(u * options.length))]!
  return { ...base, beta, omega, stiffnessFactor, yieldLengthRatio: 0.6 }
}
