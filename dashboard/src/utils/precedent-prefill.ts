import { median } from 'd3'
import type { PrecedentDescription, PrecedentMatch } from '@shared/schemas/precedents'
import { roundSignificant, type WorksheetForm } from './worksheet-form'
import type { WorksheetPrefill } from './worksheet-prefill'

/**
 * "Start from this precedent" and "start from my New frame worksheet": the two hand-overs between
 * the Precedent finder and the worksheet. Pure, no Vue.
 */

const maxOf = (xs: (number | null | undefined)[]) => {
  const v = xs.filter((x): x is number => typeof x === 'number' && Number.isFinite(x))
  return v.length ? Math.max(...v) : undefined
}

/**
 * The worksheet update for a precedent: its frame line's configuration, braced bays and bay width,
 * its stories bottom first with their heights and design story shears, and its final factors as the
 * sizing basis — the largest final β and ω over its levels (the larger factors give the larger
 * capacity-design forces) and the median final stiffness factor. Numbers in US units (ft, kip, to
 * within 1e-6 relative), converted by the worksheet; factors rounded to three decimals. Factors it lacks are left as they are.
 */
export function precedentPrefill(match: PrecedentMatch): WorksheetPrefill {
  const levels = [...match.levels].sort((a, b) => a.levelIndex - b.levelIndex)
  const finals = levels.map(l => l.final).filter(f => f !== null)
  const basis: NonNullable<WorksheetPrefill['basis']> = {}
  const beta = maxOf(finals.map(f => f.beta))
  const omega = maxOf(finals.map(f => f.omega))
  const kf = median(finals.map(f => f.stiffnessFactor).filter((x): x is number => x !== null))
  if (beta !== undefined) basis.beta = round3(beta)
  if (omega !== undefined) basis.omega = round3(omega)
  if (kf !== undefined) basis.stiffnessFactor = round3(kf)
  const factors = Object.keys(basis).length > 0
  return {
    what: factors ? 'Geometry, story heights and shears, and final factors' : 'Geometry, story heights and shears',
    source: `precedent ${match.code}, frame line ${match.frameLine}`,
    units: 'us',
    configuration: match.configuration,
    bayWidth: roundSignificant(match.bayWidthIn / 12, 1e-6),
    bracedBays: match.bays,
    // Stored values converted from other units carry float noise (391.70035818…): the shortest decimal within 1e-6 relative.
    levels: levels.map(l => ({ name: l.level, storyHeight: roundSignificant(l.storyHeightIn / 12, 1e-6), storyShear: roundSignificant(l.storyShearKip, 1e-6) })),
    basis: factors ? basis : undefined,
  }
}

function round3(v: number): number {
  return Math.round(v * 1000) / 1000
}

/** The features of a precedent search read off a worksheet (in the worksheet's units): first-story shear, stories, mean story height, bay width, configuration. */
export function descriptionFromWorksheet(form: WorksheetForm): Partial<PrecedentDescription> {
  const heights = form.levels.map(l => l.storyHeight).filter((h): h is number => h !== null && h > 0)
  const d: Partial<PrecedentDescription> = { configuration: form.configuration }
  const shear = form.levels[0]?.storyShear
  if (shear != null && shear > 0) d.storyShear = shear
  if (form.levels.length > 0) d.stories = form.levels.length
  if (heights.length) d.storyHeight = roundSignificant(heights.reduce((a, b) => a + b, 0) / heights.length, 1e-6)
  if (form.bayWidth != null && form.bayWidth > 0) d.bayWidth = form.bayWidth
  return d
}
