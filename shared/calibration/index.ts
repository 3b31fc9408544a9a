/**
 * The calibration review and starting factors, pure (no I/O): runs in Node and in the browser.
 * pairs.ts — a pair's value per quantity and its basis; stats.ts — quantiles and descriptive
 * statistics (simple-statistics, type 7 quantile); summary.ts — ratio summaries;
 * starting.ts — starting factors, shrinkage and back-test; cost.ts — cost of conservatism.
 */
export * from './pairs'
export * from './stats'
export * from './summary'
export * from './starting'
export * from './cost'

/** Five-year band of a year designed, e.g. 2013 → "2010–2014". */
export function yearBand(year: number | null): string {
  if (year === null || !Number.isFinite(year)) return 'year not stated'
  const start = Math.floor(year / 5) * 5
  return `${start}–${start + 4}`
}

/** The cautions every starting-factor answer carries. */
export const STARTING_CAUTIONS = [
  'Preliminary design aid: these are starting points drawn from past projects, not a design.',
  'Verify every value with the selected supplier’s qualified values (at the project’s deformation basis) and with the governing code and edition (ASCE 7, AISC 341, AISC 360, local code).',
  'The engineer of record decides.',
] as const
