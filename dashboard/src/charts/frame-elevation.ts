import { scaleLinear, type ScaleLinear } from 'd3'
import type { BraceConfiguration } from '@shared/engineering/geometry'

/**
 * Pure geometry of the frame elevation: columns, beams and braces as line segments in SVG
 * pixels, with the labels to draw. Takes display-ready values (any one length unit) and does
 * no engineering; the chart component only renders what this returns.
 */

export interface ElevationStory {
  name: string
  /** Story height in the same unit as `bayWidth`. */
  height: number
}

export interface ElevationInput {
  configuration: BraceConfiguration
  /** Bay width, same unit as the story heights. */
  bayWidth: number
  /** Braced bays drawn side by side (at least 1). */
  bays: number
  /** Bottom story first. */
  stories: readonly ElevationStory[]
  /** Label of the braces of each story (e.g. the chosen core area), bottom first; missing → none. */
  braceLabels?: readonly (string | undefined)[]
  width: number
  height: number
  margin?: Partial<Margin>
}

export interface Margin {
  top: number
  right: number
  bottom: number
  left: number
}

export interface Segment {
  x1: number
  y1: number
  x2: number
  y2: number
}

export interface BraceSegment extends Segment {
  /** Story index, bottom first. */
  story: number
  bay: number
  label: string | undefined
  /** Where the label goes: the middle of the brace. */
  labelX: number
  labelY: number
}

export interface LevelLabel {
  story: number
  text: string
  x: number
  y: number
}

export interface FrameElevation {
  columns: Segment[]
  beams: Segment[]
  braces: BraceSegment[]
  levelLabels: LevelLabel[]
  ground: Segment
  /** Pixel scales of the drawing (shared x/y scale, so the frame keeps its true proportions). */
  x: ScaleLinear<number, number>
  y: ScaleLinear<number, number>
}

export const ELEVATION_DEFAULTS = Object.freeze({
  margin: Object.freeze({ top: 16, right: 16, bottom: 20, left: 72 }),
  /** Cap on how wide a bay is drawn relative to the area, so one bay of a low frame does not fill a wide screen. */
  maxBayToHeightRatio: 3,
})

/** True when the input can be drawn: positive finite bay width and story heights, at least one story and bay. */
export function isDrawable(input: Pick<ElevationInput, 'bayWidth' | 'bays' | 'stories'>): boolean {
  const ok = (v: number) => Number.isFinite(v) && v > 0
  return ok(input.bayWidth) && Number.isInteger(input.bays) && input.bays >= 1 && input.stories.length > 0 && input.stories.every(s => ok(s.height))
}

/**
 * How the braces of one story of one bay run, as (from, to) points in frame units
 * (x from the bay's left column, y up from the story's floor):
 * single diagonal — bottom left to top right; inverted-V — both bottom corners up to the beam
 * midspan above; V — both top corners down to the floor beam midspan below; two-story X —
 * stories pair up from the bottom, the lower of each pair an inverted-V and the upper a V,
 * so both meet the beam they share (an odd top story is an inverted-V). derived: statics layout.
 */
export function braceLayout(configuration: BraceConfiguration, storyIndex: number, bayWidth: number, h: number): [number, number, number, number][] {
  const mid = bayWidth / 2
  const chevron: [number, number, number, number][] = [
    [0, 0, mid, h],
    [bayWidth, 0, mid, h],
  ]
  const vee: [number, number, number, number][] = [
    [0, h, mid, 0],
    [bayWidth, h, mid, 0],
  ]
  switch (configuration) {
    case 'single_diagonal':
      return [[0, 0, bayWidth, h]]
    case 'inverted_v':
      return chevron
    case 'v':
      return vee
    case 'two_story_x':
      return storyIndex % 2 === 0 ? chevron : vee
  }
}

/** Segments and labels of the elevation, scaled into `width` × `height` pixels. Empty lists when not drawable. */
export function createFrameElevation(input: ElevationInput): FrameElevation {
  const margin: Margin = { ...ELEVATION_DEFAULTS.margin, ...input.margin }
  const innerW = Math.max(1, input.width - margin.left - margin.right)
  const innerH = Math.max(1, input.height - margin.top - margin.bottom)
  const empty: FrameElevation = {
    columns: [],
    beams: [],
    braces: [],
    levelLabels: [],
    ground: { x1: margin.left, y1: input.height - margin.bottom, x2: input.width - margin.right, y2: input.height - margin.bottom },
    x: scaleLinear().domain([0, 1]).range([margin.left, margin.left + innerW]),
    y: scaleLinear().domain([0, 1]).range([margin.top + innerH, margin.top]),
  }
  if (!isDrawable(input)) return empty

  const totalW = input.bayWidth * input.bays
  const totalH = input.stories.reduce((s, st) => s + st.height, 0)
  // One pixel-per-unit for both axes keeps the brace angles true; centre the frame horizontally.
  const k = Math.min(innerW / totalW, innerH / totalH, (ELEVATION_DEFAULTS.maxBayToHeightRatio * innerH) / totalW)
  const drawnW = totalW * k
  const left = margin.left + (innerW - drawnW) / 2
  const bottom = margin.top + innerH
  const x = scaleLinear().domain([0, totalW]).range([left, left + drawnW])
  const y = scaleLinear().domain([0, totalH]).range([bottom, bottom - totalH * k])

  const columns: Segment[] = []
  const beams: Segment[] = []
  const braces: BraceSegment[] = []
  const levelLabels: LevelLabel[] = []
  let floor = 0
  input.stories.forEach((story, s) => {
    const top = floor + story.height
    for (let c = 0; c <= input.bays; c++) {
      columns.push({ x1: x(c * input.bayWidth), y1: y(floor), x2: x(c * input.bayWidth), y2: y(top) })
    }
    for (let b = 0; b < input.bays; b++) {
      const x0 = b * input.bayWidth
      beams.push({ x1: x(x0), y1: y(top), x2: x(x0 + input.bayWidth), y2: y(top) })
      for (const [ax, ay, bx, by] of braceLayout(input.configuration, s, input.bayWidth, story.height)) {
        const seg = { x1: x(x0 + ax), y1: y(floor + ay), x2: x(x0 + bx), y2: y(floor + by) }
        braces.push({ ...seg, story: s, bay: b, label: input.braceLabels?.[s], labelX: (seg.x1 + seg.x2) / 2, labelY: (seg.y1 + seg.y2) / 2 })
      }
    }
    levelLabels.push({ story: s, text: story.name, x: left - 10, y: y(floor + story.height / 2) })
    floor = top
  })
  const ground = { x1: left - 12, y1: bottom, x2: left + drawnW + 12, y2: bottom }
  return { columns, beams, braces, levelLabels, ground, x, y }
}
