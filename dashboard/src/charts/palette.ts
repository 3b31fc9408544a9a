import { palette } from '../theme'

/**
 * Backsight's categorical palette for groupings (suppliers, configurations, year bands, offices).
 * Eight hues chosen to stay apart in lightness as well as hue, so neighbours remain distinct with
 * the common colour-vision deficiencies, and each has at least 3:1 contrast on white (WCAG 2.1
 * 1.4.11, non-text contrast) so a point or a line is visible on its own. The order puts the most
 * different hues first, since most groupings have four or fewer members. The legend and the
 * tooltips always name the group as text, so colour is never the only cue.
 */
export const CATEGORICAL = [
  palette.steel700, // deep teal
  palette.amber600, // burnt amber
  '#7A4F9A', // violet
  '#B8406E', // rose
  '#2B74B0', // blue
  palette.green600, // green
  '#7F6F12', // olive
  palette.slate700, // slate
] as const

/** The colour of the i-th group (cycling after eight). */
export function categoricalColor(index: number): string {
  const n = CATEGORICAL.length
  return CATEGORICAL[((index % n) + n) % n]!
}

/** A stable colour per group name: groups sorted, so the same group keeps its colour across charts of the screen. */
export function colorMap(groups: Iterable<string>): Map<string, string> {
  const sorted = [...new Set(groups)].sort((a, b) => a.localeCompare(b, undefined, { numeric: true }))
  return new Map(sorted.map((g, i) => [g, categoricalColor(i)]))
}

/** Relative luminance of a #rrggbb colour (WCAG 2.1 definition). */
export function relativeLuminance(hex: string): number {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex)
  if (!m) throw new RangeError(`colour: expected #rrggbb, got ${hex}`)
  const lin = (c: string) => {
    const s = parseInt(c, 16) / 255
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4
  }
  return 0.2126 * lin(m[1]!) + 0.7152 * lin(m[2]!) + 0.0722 * lin(m[3]!)
}

/** WCAG 2.1 contrast ratio of two #rrggbb colours, 1…21. */
export function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x) as [number, number]
  return (hi + 0.05) / (lo + 0.05)
}
