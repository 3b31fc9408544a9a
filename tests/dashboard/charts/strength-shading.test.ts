import { interpolateRgb } from 'd3'
import { describe, expect, it } from 'vitest'
import { PENDING_SHADE, SHADE_STOPS, SHIFT_LIMIT, shadeLegend, shadeOf, shiftWords, strengthShift } from '../../../dashboard/src/charts/strength-shading'

// Colours compared through d3-interpolate (a general-purpose library), which normalises them to rgb(…).
const rgb = (c: string) => interpolateRgb(c, c)(0)

describe('strengthShift()', () => {
  it('is final / assumed − 1', () => {
    // 733.7 / 637.56 − 1 = 0.15079… (hand: 733.7 − 637.56 = 96.14; 96.14 / 637.56 = 0.150794)
    expect(strengthShift(637.56, 733.7)).toBeCloseTo(0.150794, 5)
    expect(strengthShift(500, 450)).toBeCloseTo(-0.1, 12)
  })
  it('is null when a value is missing or the assumed one is not positive', () => {
    expect(strengthShift(null, 500)).toBeNull()
    expect(strengthShift(500, null)).toBeNull()
    expect(strengthShift(0, 500)).toBeNull()
    expect(strengthShift(undefined, undefined)).toBeNull()
  })
})

describe('shadeOf()', () => {
  it('puts the neutral at no change and the ends at ±limit, clamped beyond', () => {
    expect(shadeOf(0)).toBe(rgb(SHADE_STOPS.none))
    expect(shadeOf(SHIFT_LIMIT)).toBe(rgb(SHADE_STOPS.above))
    expect(shadeOf(-SHIFT_LIMIT)).toBe(rgb(SHADE_STOPS.below))
    expect(shadeOf(0.9)).toBe(rgb(SHADE_STOPS.above))
    expect(shadeOf(-0.9)).toBe(rgb(SHADE_STOPS.below))
  })
  it('passes through the mid stops halfway (five stops: −limit, −limit/2, 0, +limit/2, +limit)', () => {
    expect(shadeOf(SHIFT_LIMIT / 2)).toBe(rgb(SHADE_STOPS.aboveMid))
    expect(shadeOf(-SHIFT_LIMIT / 2)).toBe(rgb(SHADE_STOPS.belowMid))
    // A quarter of the limit is halfway between the neutral and the upper mid stop.
    expect(shadeOf(SHIFT_LIMIT / 4)).toBe(interpolateRgb(SHADE_STOPS.none, SHADE_STOPS.aboveMid)(0.5))
  })
  it('gives pending braces the pending grey', () => {
    expect(shadeOf(null)).toBe(PENDING_SHADE)
    expect(shadeOf(Number.NaN)).toBe(PENDING_SHADE)
  })
})

describe('shadeLegend() and shiftWords()', () => {
  it('spaces the stops evenly from −15 % to +15 % and labels the ends as open', () => {
    const l = shadeLegend(7)
    expect(l.map(s => s.label)).toEqual(['−15 % or less', '−10 %', '−5 %', '±0 %', '+5 %', '+10 %', '+15 % or more'])
    expect(l[3]!.color).toBe(rgb(SHADE_STOPS.none))
    expect(() => shadeLegend(1)).toThrow(RangeError)
  })
  it('says the shift in words', () => {
    expect(shiftWords(0.0421)).toBe('final Cmax 4.2 % above assumed')
    expect(shiftWords(-0.05)).toBe('final Cmax 5.0 % below assumed')
    expect(shiftWords(0)).toBe('final Cmax equal to assumed')
    expect(shiftWords(null)).toBe('final values pending')
  })
})
