import { findBrbfSystemRow, heightLimitFt, type Asce7Edition, type SeismicDesignCategory } from '@shared/engineering/code-tables'
import type { BuildingUse, Zone } from './catalog'
import { roundTo, type Random } from './random'

/**
 * Seismic site and code parameters of one demo project: risk category and Ie, SDS/SD1/S1, site
 * class, seismic design category, system coefficients and height limit.
 */

export type RiskCategory = 'I' | 'II' | 'III' | 'IV'

/** Ie by risk category: 1.0 / 1.0 / 1.25 / 1.5 (ASCE 7-16 Table 1.5-2, from memory). */
export const IMPORTANCE_FACTOR: Record<RiskCategory, number> = { I: 1, II: 1, III: 1.25, IV: 1.5 }

/** A plausible risk category for a building use (ASCE 7-16 Table 1.5-1 in outline, from memory). */
export function riskCategoryFor(use: BuildingUse, zone: Zone, rng: Random): RiskCategory {
  switch (use) {
    case 'healthcare':
      // Near-fault healthcare work in the demo is mostly essential facilities (hospitals).
      return rng.chance(zone === 'near_fault' ? 0.85 : 0.5) ? 'IV' : 'III'
    case 'school':
      return 'III'
    case 'laboratory':
      return rng.chance(0.3) ? 'III' : 'II'
    case 'parking':
    case 'industrial':
      return rng.chance(0.1) ? 'I' : 'II'
    default:
      return 'II'
  }
}

/**
 * Seismic design category from SDS, SD1, S1 and risk category (ASCE 7-16 §11.6, Tables 11.6-1 and
 * 11.6-2, from memory): S1 ≥ 0.75 g gives E (RC I–III) or F (RC IV); otherwise the more severe of the
 * SDS and SD1 tables, where RC IV moves B → C and C → D.
 */
export function seismicDesignCategory(sds: number, sd1: number, s1: number, rc: RiskCategory): SeismicDesignCategory | 'A' {
  const iv = rc === 'IV'
  if (s1 >= 0.75) return iv ? 'F' : 'E'
  const bySds = sds < 0.167 ? 0 : sds < 0.33 ? 1 : sds < 0.5 ? 2 : 3
  const bySd1 = sd1 < 0.067 ? 0 : sd1 < 0.133 ? 1 : sd1 < 0.2 ? 2 : 3
  let category = Math.max(bySds, bySd1)
  if (iv && category > 0 && category < 3) category += 1
  return (['A', 'B', 'C', 'D'] as const)[category]!
}

/** Spectral values of a site in a seismicity zone, g (invented but in the usual ranges). */
export function drawSpectrum(zone: Zone, rng: Random): { sds: number; sd1: number; s1: number; siteClass: string } {
  switch (zone) {
    case 'moderate': {
      const sds = roundTo(rng.between(0.34, 0.49), 3)
      const sd1 = roundTo(rng.between(0.135, 0.195), 3)
      return { sds, sd1, s1: roundTo(sd1 / 1.6, 3), siteClass: rng.weighted([['B', 1], ['C', 3], ['D', 5], ['E', 1]]) }
    }
    case 'high': {
      const sds = roundTo(rng.between(0.6, 1.3), 3)
      const sd1 = roundTo(Math.max(0.21, sds * rng.between(0.38, 0.62)), 3)
      return { sds, sd1, s1: roundTo(Math.min(0.72, sd1 / 1.15), 3), siteClass: rng.weighted([['B', 1], ['C', 3], ['D', 6]]) }
    }
    case 'near_fault': {
      const s1 = roundTo(rng.between(0.75, 1.0), 3)
      const sds = roundTo(rng.between(1.2, 2.0), 3)
      const sd1 = roundTo(s1 * rng.between(0.8, 1.15), 3)
      return { sds, sd1, s1, siteClass: rng.weighted([['B', 1], ['C', 4], ['D', 5]]) }
    }
  }
}

/** System coefficients used: ASCE 7 Table 12.2-1 BRBF building-frame row of the edition (engine code tables). */
export function systemRowFor(edition: Asce7Edition, rng: Random): { r: number; cd: number; omega0: number; row: NonNullable<ReturnType<typeof findBrbfSystemRow>> } {
  // ASCE 7-05 split BRBF by beam-column connection: R 7 (pinned) or R 8 (moment-resisting), engineering reference §2 [P].
  const beamColumnConnection = edition === '7-05' ? (rng.chance(0.65) ? 'non_moment_resisting' : 'moment_resisting') : undefined
  const row = findBrbfSystemRow({ edition, ...(beamColumnConnection ? { beamColumnConnection } : {}) })
  if (!row) throw new Error(`no BRBF row for ${edition}`)
  return { r: row.r, cd: row.cd, omega0: row.omega0, row }
}

/**
 * Largest height allowed for a BRBF building frame in an SDC: the Table 12.2-1 limit raised per
 * ASCE 7-16 §12.2.5.4 (160 → 240 ft in D/E, 100 → 160 ft in F; from memory), `Infinity` for NL.
 */
export function maxHeightFt(row: Parameters<typeof heightLimitFt>[0], sdc: SeismicDesignCategory): number {
  const limit = heightLimitFt(row, sdc)
  if (limit === null) return Infinity
  return limit === 160 ? 240 : limit === 100 ? 160 : limit
}
