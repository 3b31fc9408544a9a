import { EngineeringInputError } from './errors'

/**
 * ASCE 7 Table 12.2-1 rows for steel buckling-restrained braced frames, by edition, as data.
 * Height limits in feet by seismic design category; `null` means NL (not limited).
 * Status tags follow the engineering reference §2: 'P' partly verified, 'M' from memory.
 * Have someone with the standards sign off the 'M' rows before they become product defaults.
 */

/** ASCE 7 editions with BRBF rows here. */
export type Asce7Edition = '7-05' | '7-10' | '7-16' | '7-22'

/** Seismic design categories with a height-limit column in Table 12.2-1. */
export type SeismicDesignCategory = 'B' | 'C' | 'D' | 'E' | 'F'

/** One BRBF row of ASCE 7 Table 12.2-1. */
export interface BrbfSystemRow {
  edition: Asce7Edition
  /** Row label in the table, e.g. 'B.26'. */
  row: string
  /** 'building_frame' (Table 12.2-1 part B) or 'dual_smf' (dual system with special moment frames, part D). */
  systemType: 'building_frame' | 'dual_smf'
  /** Through 7-05 the table split BRBF by beam-column connection; `null` for later editions. */
  beamColumnConnection: 'moment_resisting' | 'non_moment_resisting' | null
  /** AISC 341 / ASCE 7 detailing reference section. */
  detailingSection: string
  r: number
  omega0: number
  cd: number
  /** Height limit in ft by SDC; null = NL (not limited). */
  heightLimitFt: Record<SeismicDesignCategory, number | null>
  status: 'P' | 'M'
  source: string
  note?: string
}

const LIMITED = { B: null, C: null, D: 160, E: 160, F: 100 } as const
const UNLIMITED = { B: null, C: null, D: null, E: null, F: null } as const

/** BRBF rows of ASCE 7 Table 12.2-1 (engineering reference §2). */
export const BRBF_SYSTEM_ROWS: readonly BrbfSystemRow[] = Object.freeze([
  {
    edition: '7-05', row: 'B.25', systemType: 'building_frame', beamColumnConnection: 'non_moment_resisting',
    detailingSection: '14.1', r: 7, omega0: 2, cd: 5.5, heightLimitFt: { ...LIMITED }, status: 'P',
    source: 'ASCE 7-05 Table 12.2-1',
  },
  {
    edition: '7-05', row: 'B.26', systemType: 'building_frame', beamColumnConnection: 'moment_resisting',
    detailingSection: '14.1', r: 8, omega0: 2.5, cd: 5, heightLimitFt: { ...LIMITED }, status: 'P',
    source: 'ASCE 7-05 Table 12.2-1',
  },
  {
    edition: '7-10', row: 'B.26', systemType: 'building_frame', beamColumnConnection: null,
    detailingSection: '14.1', r: 8, omega0: 2.5, cd: 5, heightLimitFt: { ...LIMITED }, status: 'P',
    source: 'ASCE 7-10 Table 12.2-1', note: 'Values partly verified; the row label is from memory.',
  },
  {
    edition: '7-16', row: 'B.26', systemType: 'building_frame', beamColumnConnection: null,
    detailingSection: '14.1', r: 8, omega0: 2.5, cd: 5, heightLimitFt: { ...LIMITED }, status: 'P',
    source: 'ASCE 7-16 Table 12.2-1',
  },
  {
    edition: '7-16', row: 'D.3', systemType: 'dual_smf', beamColumnConnection: null,
    detailingSection: '14.1', r: 8, omega0: 2.5, cd: 5, heightLimitFt: { ...UNLIMITED }, status: 'M',
    source: 'ASCE 7-16 Table 12.2-1',
  },
  {
    edition: '7-22', row: 'B.26', systemType: 'building_frame', beamColumnConnection: null,
    detailingSection: '14.1', r: 8, omega0: 2.5, cd: 5, heightLimitFt: { ...LIMITED }, status: 'M',
    source: 'ASCE 7-22 Table 12.2-1', note: 'Believed unchanged from 7-16; check the row label.',
  },
  {
    edition: '7-22', row: 'D.3', systemType: 'dual_smf', beamColumnConnection: null,
    detailingSection: '14.1', r: 8, omega0: 2.5, cd: 5, heightLimitFt: { ...UNLIMITED }, status: 'M',
    source: 'ASCE 7-22 Table 12.2-1', note: 'Believed unchanged from 7-16; check the row label.',
  },
].map((row) => Object.freeze(row as BrbfSystemRow)))

const EDITIONS: readonly Asce7Edition[] = ['7-05', '7-10', '7-16', '7-22']

/**
 * Find the BRBF row for an edition and system type (default 'building_frame'). For 7-05, pass
 * `beamColumnConnection` to pick between the two rows (R = 7 without, R = 8 with moment-resisting
 * connections). Returns `undefined` when no row matches or the choice is ambiguous.
 * Throws `EngineeringInputError` (field `edition`) for an unknown edition.
 */
export function findBrbfSystemRow(options: {
  edition: Asce7Edition
  systemType?: BrbfSystemRow['systemType']
  beamColumnConnection?: 'moment_resisting' | 'non_moment_resisting'
}): BrbfSystemRow | undefined {
  const { edition, systemType = 'building_frame', beamColumnConnection } = options
  if (!EDITIONS.includes(edition)) {
    throw new EngineeringInputError('edition', `must be one of ${EDITIONS.join(', ')} (got ${JSON.stringify(edition)}).`)
  }
  const rows = BRBF_SYSTEM_ROWS.filter(
    (row) =>
      row.edition === edition &&
      row.systemType === systemType &&
      (row.beamColumnConnection === null || beamColumnConnection === undefined || row.beamColumnConnection === beamColumnConnection),
  )
  return rows.length === 1 ? rows[0] : undefined
}

/**
 * Height limit in ft of a row for a seismic design category, `null` for NL (not limited).
 * The 12.2.5.4 increase (160 → 240 ft in SDC D/E, 100 → 160 ft in SDC F, from memory) is not applied.
 */
export function heightLimitFt(row: BrbfSystemRow, sdc: SeismicDesignCategory): number | null {
  if (!(sdc in row.heightLimitFt)) {
    throw new EngineeringInputError('sdc', `must be one of B, C, D, E, F (got ${JSON.stringify(sdc)}); SDC A has no Table 12.2-1 limit.`)
  }
  return row.heightLimitFt[sdc]
}
