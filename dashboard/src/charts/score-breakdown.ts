import { scaleLinear } from 'd3'
import { PRECEDENT_FEATURES, type FeatureContribution, type PrecedentFeature } from '@shared/schemas/precedents'
import { categoricalColor } from './palette'

/**
 * The per-feature breakdown of a precedent's score as a stacked bar: each feature's contribution
 * wᵢ·dᵢ / Σw to the weighted distance D (they sum to D; `shared/precedents/similarity.ts`), laid
 * end to end on one scale shared by every match of the list, so a shorter bar is a closer match and
 * each segment says which feature kept it apart. Pure: Vue draws the SVG.
 */

export const FEATURE_LABELS: Record<PrecedentFeature, string> = {
  storyShear: 'Story shear',
  stories: 'Stories',
  storyHeight: 'Story height',
  bayWidth: 'Bay width',
  configuration: 'Configuration',
  sdc: 'SDC',
  buildingUse: 'Building use',
  supplier: 'Supplier',
}

/** One colour per feature, fixed by the feature's place in `PRECEDENT_FEATURES` (eight features, eight hues). */
export const FEATURE_COLORS = Object.fromEntries(PRECEDENT_FEATURES.map((f, i) => [f, categoricalColor(i)])) as Record<PrecedentFeature, string>

export interface BreakdownSegment {
  feature: PrecedentFeature
  /** Left edge and width in pixels. */
  x: number
  width: number
  color: string
  contribution: number
}

/** The largest distance of `matches` (the scale's upper end); a small floor keeps identical matches drawable. */
export function breakdownDomainMax(matches: readonly { distance: number }[]): number {
  const max = Math.max(0, ...matches.map(m => (Number.isFinite(m.distance) ? m.distance : 0)))
  return max > 0 ? max : 1
}

/**
 * Segments of one match's bar, in the features' fixed order, on the scale [0, `max`] → [0, `width`] px.
 * Features that contribute nothing (identical on that feature) get no segment.
 */
export function createBreakdownSegments(breakdown: readonly FeatureContribution[], { width, max }: { width: number; max: number }): BreakdownSegment[] {
  const x = scaleLinear().domain([0, max]).range([0, width]).clamp(true)
  const order = (f: PrecedentFeature) => PRECEDENT_FEATURES.indexOf(f)
  let at = 0
  return [...breakdown]
    .filter(b => b.contribution > 0 && Number.isFinite(b.contribution))
    .sort((a, b) => order(a.feature) - order(b.feature))
    .map(b => {
      const x0 = x(at)
      at += b.contribution
      return { feature: b.feature, x: x0, width: Math.max(0, x(at) - x0), color: FEATURE_COLORS[b.feature], contribution: b.contribution }
    })
}

/** Words for the bar (its text alternative): the similarity, then what kept it apart, largest first, then what matched. */
export function describeBreakdown(breakdown: readonly FeatureContribution[], similarity: number): string {
  const apart = breakdown.filter(b => b.contribution > 0).sort((a, b) => b.contribution - a.contribution)
  const same = breakdown.filter(b => b.contribution === 0).map(b => FEATURE_LABELS[b.feature].toLowerCase())
  const parts = [`Similarity ${Math.round(similarity * 100)} %.`]
  if (apart.length) parts.push(`Distance by feature: ${apart.map(b => `${FEATURE_LABELS[b.feature].toLowerCase()} ${b.contribution.toFixed(2)}`).join(', ')}.`)
  if (same.length) parts.push(`Same ${same.join(', ')}.`)
  return parts.join(' ')
}
