import { STARTING_QUANTITIES, type StartingFactors, type StartingFactorsQuery, type StartingQuantity, type StartingSuggestion } from '@shared/schemas/calibration'
import type { WorksheetPrefill } from './worksheet-prefill'

export type ChosenSuggestions = Partial<Record<StartingQuantity, StartingSuggestion>>

/** The AISC 341 edition year named in a basis label ("… AISC 341-16" → 2016), or 0 when none. */
export function editionYear(basis: string): number {
  const m = /341-(\d{2})\b/.exec(basis)
  return m ? 2000 + Number(m[1]) : 0
}

/**
 * The suggestions of each quantity (the API gives one per basis), and the one to start from by
 * default: the largest comparable group, then the newer AISC 341 edition.
 */
export function suggestionsByQuantity(result: StartingFactors): { quantity: StartingQuantity; options: StartingSuggestion[]; chosen: StartingSuggestion | undefined }[] {
  return STARTING_QUANTITIES.map(quantity => {
    const options = result.suggestions
      .filter(s => s.quantity === quantity)
      .sort((a, b) => b.groupSize - a.groupSize || editionYear(b.basis) - editionYear(a.basis) || a.basis.localeCompare(b.basis))
    return { quantity, options, chosen: options[0] }
  })
}

/**
 * The New frame worksheet update for a set of starting factors: β, ω and the stiffness factor of
 * the chosen suggestions, and the capacity basis as an ordered yield window — Fysc,max from the
 * chosen expected-yield suggestion, else the API's suggested capacity basis. Stresses are in ksi,
 * so the numbers are in US units and the worksheet converts them. Pure.
 */
export function startingFactorsPrefill(
  result: StartingFactors,
  chosen: ChosenSuggestions,
  query: Pick<StartingFactorsQuery, 'supplier' | 'configuration' | 'quantile'>,
  names: { supplierName?: string; configurationName?: string } = {},
): WorksheetPrefill {
  const pick = (q: StartingQuantity) => chosen[q]?.suggested
  const basis: NonNullable<WorksheetPrefill['basis']> = {
    basisKind: 'yieldRange',
    fyscMax: Math.round((pick('overstrength') ?? result.capacityBasis.fyscMax) * 10) / 10,
  }
  const beta = pick('beta')
  const omega = pick('omega')
  const kf = pick('stiffness')
  if (beta !== undefined) basis.beta = roundFactor(beta)
  if (omega !== undefined) basis.omega = roundFactor(omega)
  if (kf !== undefined) basis.stiffnessFactor = roundFactor(kf)
  return { what: 'Starting factors', source: describeStartingQuery(result.quantile, query, names), units: 'us', basis }
}

/** A factor to three decimals, as an engineer would type it (1.1347… → 1.135). */
export function roundFactor(v: number): number {
  return Math.round(v * 1000) / 1000
}

/** "the 90th percentile of SUP-A’s inverted-V braces": what the factors were drawn from. */
export function describeStartingQuery(
  quantile: number,
  query: Pick<StartingFactorsQuery, 'supplier' | 'configuration'>,
  names: { supplierName?: string; configurationName?: string } = {},
): string {
  const who = query.supplier ? `${names.supplierName ?? query.supplier}’s` : 'all suppliers’'
  const what = query.configuration ? ` ${names.configurationName ?? query.configuration}` : ''
  return `the ${ordinal(Math.round(quantile * 100))} percentile of ${who}${what} braces`
}

/** 1 → 1st, 2 → 2nd, 3 → 3rd, 11 → 11th, 90 → 90th. */
export function ordinal(n: number): string {
  const tens = n % 100
  if (tens >= 11 && tens <= 13) return `${n}th`
  return `${n}${({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th'}`
}
