import type { GlobalThemeOverrides } from 'naive-ui'

/**
 * Backsight's visual identity, in one place: palette, type scale and spacing.
 * Deep steel teal for structure, a warm amber for what needs attention, quiet slate greys.
 * Everything else (naive-ui overrides, CSS custom properties) is derived from these tokens.
 */
export const palette = {
  ink: '#17262D',
  steel900: '#163944',
  steel700: '#1F5666',
  steel500: '#2F7A8C',
  steel300: '#8DB8C3',
  steel100: '#E4EFF2',
  // Text tokens are at least 4.5:1 on every light surface below (WCAG 2.1 SC 1.4.3); tests/dashboard/theme.test.ts checks it.
  amber600: '#9E5716',
  amber400: '#E6A157',
  amber100: '#FBEEDD',
  red600: '#B23A3A',
  green600: '#276B43',
  slate700: '#46545B',
  slate500: '#5E6C74',
  slate300: '#C5CED2',
  slate100: '#F1F4F5',
  paper: '#FBFCFC',
  white: '#FFFFFF',
} as const

/** Type scale in px (a 1.2 ratio, rounded). */
export const typeScale = { xs: 12, sm: 13, base: 14, md: 16, lg: 19, xl: 23, xxl: 28 } as const

/** Spacing steps in px. */
export const space = { 1: 4, 2: 8, 3: 12, 4: 16, 5: 24, 6: 32, 7: 48 } as const

export const fontFamily = '"Public Sans", system-ui, sans-serif'

export const themeOverrides: GlobalThemeOverrides = {
  common: {
    fontFamily,
    fontSize: `${typeScale.base}px`,
    fontSizeMedium: `${typeScale.base}px`,
    fontSizeLarge: `${typeScale.md}px`,
    primaryColor: palette.steel700,
    primaryColorHover: palette.steel500,
    primaryColorPressed: palette.steel900,
    primaryColorSuppl: palette.steel500,
    warningColor: palette.amber600,
    warningColorHover: palette.amber400,
    errorColor: palette.red600,
    successColor: palette.green600,
    textColorBase: palette.ink,
    bodyColor: palette.slate100,
    borderRadius: '6px',
  },
  Layout: { siderColor: palette.steel900, headerColor: palette.white, color: palette.slate100 },
  Menu: {
    itemTextColorInverted: palette.steel100,
    itemTextColorHoverInverted: palette.white,
    itemTextColorActiveInverted: palette.white,
    itemColorActiveInverted: palette.steel700,
    itemColorActiveHoverInverted: palette.steel500,
    itemIconColorInverted: palette.steel300,
    itemIconColorActiveInverted: palette.amber400,
  },
  Card: { borderRadius: '8px' },
  // naive-ui's own empty-state grey (#c2c2c2) is 1.8:1 on white; use the muted text token instead.
  Empty: { textColor: palette.slate500, iconColor: palette.slate300 },
  LoadingBar: { colorLoading: palette.amber400 },
}

/** The same tokens as CSS custom properties, for plain styles and SVG charts. */
export function cssVariables(): Record<string, string> {
  const vars: Record<string, string> = { '--font-family': fontFamily }
  for (const [k, v] of Object.entries(palette)) vars[`--c-${k}`] = v
  for (const [k, v] of Object.entries(typeScale)) vars[`--fs-${k}`] = `${v}px`
  for (const [k, v] of Object.entries(space)) vars[`--sp-${k}`] = `${v}px`
  return vars
}
