import { describe, expect, it } from 'vitest'
import { contrastRatio } from '../../dashboard/src/charts/palette'
import { palette } from '../../dashboard/src/theme'

// WCAG 2.1 SC 1.4.3 Contrast (Minimum): normal-size text needs at least 4.5:1 against its background.
describe('theme text tokens', () => {
  const surfaces = { white: palette.white, paper: palette.paper, slate100: palette.slate100, steel100: palette.steel100, amber100: palette.amber100 }
  const text = { ink: palette.ink, slate700: palette.slate700, slate500: palette.slate500, steel700: palette.steel700, amber600: palette.amber600, red600: palette.red600, green600: palette.green600 }
  for (const [tName, t] of Object.entries(text)) {
    it(`${tName} reads at 4.5:1 or more on every light surface`, () => {
      for (const [sName, s] of Object.entries(surfaces)) expect(contrastRatio(t, s), `${tName} on ${sName}`).toBeGreaterThanOrEqual(4.5)
    })
  }
  it('keeps the navigation text and the focus ring legible on the dark sider', () => {
    // Sider text steel100 on steel900 (AA 4.5:1); the focus ring amber400 on steel900 (SC 1.4.11 non-text, 3:1).
    expect(contrastRatio(palette.steel100, palette.steel900)).toBeGreaterThanOrEqual(4.5)
    expect(contrastRatio(palette.amber400, palette.steel900)).toBeGreaterThanOrEqual(3)
    // The light-surface focus ring steel500 on white and on the page grey (3:1).
    expect(contrastRatio(palette.steel500, palette.white)).toBeGreaterThanOrEqual(3)
    expect(contrastRatio(palette.steel500, palette.slate100)).toBeGreaterThanOrEqual(3)
  })
})
