import type { PercentileBand, ProposalBody, ProposalResponse } from '../schemas/benchmarks'

/**
 * The proposal sheet's content as labelled rows: one source for the printable page, the CSV and
 * the server-made PDF, so the three always say the same. Pure. Numbers are in the units of the
 * profile (`units`): floor area ft² or m², steel per floor area lb/ft² or kg/m², tonnage short tons or tonnes.
 * It names no project and no client: the proposal answer carries none.
 */

export const USE_LABELS: Record<string, string> = {
  office: 'Office',
  laboratory: 'Laboratory',
  healthcare: 'Healthcare',
  school: 'School',
  residential: 'Residential',
  parking: 'Parking',
  industrial: 'Industrial',
  mixed: 'Mixed use',
  other: 'Other',
}

export const useLabel = (use: string) => USE_LABELS[use] ?? use

export interface SheetRow {
  label: string
  value: string
}

export interface BandRow {
  label: string
  unit: string
  n: number
  p10: string
  p25: string
  p50: string
  p75: string
  p90: string
}

export interface ExpectedRow {
  label: string
  unit: string
  low: string
  median: string
  high: string
}

export interface ProposalSheet {
  title: string
  profile: SheetRow[]
  /** Which past projects the range comes from (criteria and count), or why there is none. */
  basis: string
  bands: BandRow[]
  expected: ExpectedRow[]
  cautions: string[]
}

/** A figure with `digits` decimals and thousands separators (en-US), "—" when missing. */
export function formatFigure(v: number | null | undefined, digits: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—'
  return v.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits })
}

/** Tonnage to a sensible precision: whole tons from 100 up, one decimal below. */
export function formatTonnage(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—'
  return formatFigure(v, Math.abs(v) >= 100 ? 0 : 1)
}

const CRITERIA_LABELS: Record<string, string> = { use: 'use', heightBand: 'height', sdc: 'SDC', region: 'region' }

/** "office, 4–7 stories, SDC D" (or "all projects"). */
export function describeGroup(criteria: Record<string, string>): string {
  const parts = Object.entries(criteria).map(([k, v]) => (k === 'use' ? useLabel(v) : k === 'heightBand' ? v : `${CRITERIA_LABELS[k] ?? k} ${v}`))
  return parts.length ? parts.join(', ') : 'all projects'
}

/** The sheet for `profile` and the API's `result`. */
export function proposalSheet(profile: ProposalBody, result: ProposalResponse): ProposalSheet {
  const si = profile.units === 'si'
  const areaUnit = si ? 'm²' : 'ft²'
  const tonUnit = si ? 'tonnes' : 'tons'
  const band = (label: string, b: PercentileBand | null): BandRow[] =>
    b
      ? [{ label, unit: result.perFloorAreaUnit, n: b.n, p10: formatFigure(b.p10, 2), p25: formatFigure(b.p25, 2), p50: formatFigure(b.p50, 2), p75: formatFigure(b.p75, 2), p90: formatFigure(b.p90, 2) }]
      : []
  const expected = (label: string, e: ProposalResponse['expectedLateral']): ExpectedRow[] =>
    e ? [{ label, unit: tonUnit, low: formatTonnage(e.low), median: formatTonnage(e.median), high: formatTonnage(e.high) }] : []
  return {
    title: 'Steel tonnage benchmark for a fee proposal',
    profile: [
      { label: 'Building use', value: useLabel(profile.use) },
      { label: 'Stories above grade', value: String(profile.stories) },
      { label: 'Gross floor area', value: `${formatFigure(profile.floorArea, 0)} ${areaUnit}` },
      { label: 'Seismic design category', value: profile.sdc ?? 'not given' },
      { label: 'Region', value: profile.region ?? 'not given' },
    ],
    basis: result.group
      ? `${result.group.n} finished past projects of the firm: ${describeGroup(result.group.criteria)}. Expected tonnage = the group’s P25, median and P75 per floor area × this floor area.`
      : 'No benchmark: the history has too few comparable projects with tonnage and floor area.',
    bands: [...band('Lateral-system steel per floor area', result.lateralPerFloorArea), ...band('Total structural steel per floor area', result.structuralPerFloorArea)],
    expected: [...expected('Lateral-system steel', result.expectedLateral), ...expected('Total structural steel', result.expectedStructural)],
    cautions: result.cautions,
  }
}

/** One CSV field, quoted when needed; a leading = + - @ is neutralised so spreadsheets do not run it as a formula. */
function csvField(v: string | number): string {
  let s = String(v)
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

/** The sheet as CSV (section, item, columns…), for a spreadsheet. */
export function proposalSheetCsv(sheet: ProposalSheet, generatedAt: string): string {
  const rows: (string | number)[][] = [['section', 'item', 'unit', 'n', 'P10', 'P25', 'median', 'P75', 'P90']]
  rows.push(['sheet', sheet.title, '', '', '', '', '', '', ''])
  rows.push(['sheet', `generated ${generatedAt}`, '', '', '', '', '', '', ''])
  for (const p of sheet.profile) rows.push(['profile', p.label, p.value, '', '', '', '', '', ''])
  rows.push(['basis', sheet.basis, '', '', '', '', '', '', ''])
  for (const b of sheet.bands) rows.push(['benchmark', b.label, b.unit, b.n, b.p10, b.p25, b.p50, b.p75, b.p90])
  for (const e of sheet.expected) rows.push(['expected tonnage', e.label, e.unit, '', '', e.low, e.median, e.high, ''])
  for (const c of sheet.cautions) rows.push(['caution', c, '', '', '', '', '', '', ''])
  return rows.map(r => r.map(csvField).join(',')).join('\r\n') + '\r\n'
}
