import { describe, expect, it } from 'vitest'
import { createLineChart } from '../../../dashboard/src/charts/line-chart'
import { backtestSeries } from '../../../dashboard/src/charts/backtest'

describe('createLineChart', () => {
  const geo = createLineChart({
    width: 400,
    height: 200,
    margin: { top: 0, right: 0, bottom: 0, left: 0 },
    include: [1],
    series: [
      {
        key: 'm',
        label: 'median',
        color: '#000',
        points: [
          { x: 2012, y: 1.1, lo: 1.0, hi: 1.2 },
          { x: 2010, y: 1.05, lo: 0.95, hi: 1.15 },
        ],
      },
    ],
  })

  it('runs x over the years and sorts the points by year', () => {
    const dots = geo.series[0]!.dots
    expect(dots.map(d => d.x)).toEqual([2010, 2012])
    expect(dots[0]!.cx).toBe(0)
    expect(dots[1]!.cx).toBe(400)
  })

  it('draws the line through the medians and the band between the quartiles', () => {
    const s = geo.series[0]!
    // d3.line: "M x,y L x,y" through (2010, 1.05) and (2012, 1.1).
    // d3-path writes 3 decimals, so the numbers are compared, not the text.
    const nums = (d: string) => d.match(/-?\d+(\.\d+)?/g)!.map(Number)
    const line = nums(s.path)
    expect(s.path).toMatch(/^M[^L]+L[^L]+$/)
    expect(line[0]).toBe(0)
    expect(line[1]).toBeCloseTo(geo.y(1.05), 3)
    expect(line[2]).toBe(400)
    expect(line[3]).toBeCloseTo(geo.y(1.1), 3)
    // d3.area: upper edge forward (hi), lower edge back (lo): 2010 → 1.15, 2012 → 1.2, then 2012 → 1.0, 2010 → 0.95.
    const band = nums(s.bandPath!)
    expect(band[1]).toBeCloseTo(geo.y(1.15), 3)
    expect(band[3]).toBeCloseTo(geo.y(1.2), 3)
    expect(band[5]).toBeCloseTo(geo.y(1.0), 3)
    expect(band[7]).toBeCloseTo(geo.y(0.95), 3)
  })

  it('keeps the values it must include (ratio 1) on the y axis', () => {
    const [lo, hi] = geo.y.domain() as [number, number]
    expect(lo).toBeLessThanOrEqual(0.95)
    expect(hi).toBeGreaterThanOrEqual(1.2)
  })

  it('uses a fixed y domain as given (rates 0–1) and labels only whole years', () => {
    const g = createLineChart({ width: 300, height: 150, yDomain: [0, 1], series: [{ key: 'r', label: 'r', color: '#000', points: [{ x: 2015, y: 0.2 }] }] })
    expect(g.y.domain()).toEqual([0, 1])
    // One year alone is widened to 2014–2016.
    expect(g.x.domain()).toEqual([2014, 2016])
    expect(g.xTicks.every(t => Number.isInteger(t.value))).toBe(true)
  })
})

describe('backtestSeries', () => {
  it('pairs the suggestion (solid) with the habit (dashed) for rates and conservatism, by year', () => {
    const years = [2019, 2018].map((year, i) => ({
      year,
      projects: 4,
      braces: 30,
      trainedOn: 20 + i,
      suggested: 1.1,
      suggestedUnderestimateRate: 0.1 * (i + 1),
      suggestedMeanConservatism: 1.05,
      habitUnderestimateRate: 0.3,
      habitMeanConservatism: 0.98,
    }))
    const s = backtestSeries(years)
    expect(s.rates.map(r => r.key)).toEqual(['suggested', 'habit'])
    expect(s.rates[0]!.points).toEqual([
      { x: 2018, y: 0.2 },
      { x: 2019, y: 0.1 },
    ])
    expect(s.rates[1]!.dashed).toBe(true)
    expect(s.conservatism[1]!.points.map(p => p.y)).toEqual([0.98, 0.98])
  })
})
