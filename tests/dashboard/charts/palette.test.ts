import { describe, expect, it } from 'vitest'
import { CATEGORICAL, categoricalColor, colorMap, contrastRatio, relativeLuminance } from '../../../dashboard/src/charts/palette'

describe('contrastRatio (WCAG 2.1 definition)', () => {
  it('matches the reference values', () => {
    // WCAG 2.1 "contrast ratio": black on white is 21:1, a colour on itself 1:1.
    expect(contrastRatio('#000000', '#FFFFFF')).toBeCloseTo(21, 9)
    expect(contrastRatio('#336699', '#336699')).toBe(1)
    // #767676 on white is the lightest grey passing 4.5:1 (widely quoted, from memory: 4.54:1).
    expect(contrastRatio('#767676', '#FFFFFF')).toBeCloseTo(4.54, 2)
    expect(relativeLuminance('#FFFFFF')).toBe(1)
  })
  it('rejects anything but #rrggbb', () => {
    expect(() => relativeLuminance('red')).toThrow(RangeError)
  })
})

describe('the categorical palette', () => {
  it('gives every colour at least 3:1 against white (WCAG 2.1 SC 1.4.11 non-text contrast)', () => {
    for (const c of CATEGORICAL) expect(contrastRatio(c, '#FFFFFF')).toBeGreaterThanOrEqual(3)
  })
  it('has eight distinct colours and cycles after them', () => {
    expect(new Set(CATEGORICAL.map(c => c.toLowerCase())).size).toBe(8)
    expect(categoricalColor(8)).toBe(categoricalColor(0))
    expect(categoricalColor(-1)).toBe(categoricalColor(7))
  })
  it('keeps a group’s colour whatever order the groups come in', () => {
    const a = colorMap(['SUP-B', 'SUP-A', 'SUP-B'])
    const b = colorMap(['SUP-A', 'SUP-B'])
    expect([...a]).toEqual([...b])
    expect(a.get('SUP-A')).toBe(CATEGORICAL[0])
  })
})
