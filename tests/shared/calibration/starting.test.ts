import { describe, expect, it } from 'vitest'
import { backtest, credibilityWeight, habitOf, scoreValue, shrunkQuantile, suggestStarting, type FactorColumns } from '@shared/calibration'

/**
 * A small hand-made history of final β values (one brace per project for easy arithmetic):
 * row  project  designed  completed  assumed  final   in group
 *  0      1       2010      2011       1.10    1.20      yes
 *  1      2       2011      —          1.10    1.10      yes   (completion missing → counts as finished 2011)
 *  2      3       2012      2013       1.15    1.30      yes
 *  3      4       2012      2014       1.15    1.00      no
 *  4      5       2013      2014       1.20    1.25      yes
 */
const cols: FactorColumns = {
  projectId: [1, 2, 3, 4, 5],
  yearDesigned: [2010, 2011, 2012, 2012, 2013],
  yearCompleted: [2011, NaN, 2013, 2014, 2014],
  assumed: [1.1, 1.1, 1.15, 1.15, 1.2],
  final: [1.2, 1.1, 1.3, 1.0, 1.25],
}
const group = [0, 1, 2, 4]
const firm = [0, 1, 2, 3, 4]

describe('shrinkage toward the firm-wide value', () => {
  it('weight is n / minGroupSize below the threshold and 1 at or above it', () => {
    expect(credibilityWeight(4, 10)).toBe(0.4)
    expect(credibilityWeight(10, 10)).toBe(1)
    expect(credibilityWeight(25, 10)).toBe(1)
  })

  it('suggested = w·group + (1 − w)·firm', () => {
    // Group finals sorted 1.10, 1.20, 1.25, 1.30: P90 h = 3·0.9 = 2.7 → 1.25 + 0.7·0.05 = 1.285.
    // Firm finals sorted 1.00, 1.10, 1.20, 1.25, 1.30: P90 h = 4·0.9 = 3.6 → 1.25 + 0.6·0.05 = 1.28.
    // 4 projects against a threshold of 10: w = 0.4 → 0.4·1.285 + 0.6·1.28 = 0.514 + 0.768 = 1.282.
    const v = shrunkQuantile([1.1, 1.2, 1.25, 1.3], [1.0, 1.1, 1.2, 1.25, 1.3], 0.9, 10, 4)
    expect(v.groupValue).toBeCloseTo(1.285, 12)
    expect(v.firmValue).toBeCloseTo(1.28, 12)
    expect(v.weight).toBe(0.4)
    expect(v.shrunk).toBe(true)
    expect(v.suggested).toBeCloseTo(1.282, 12)
    // An empty group takes the firm's value.
    expect(shrunkQuantile([], [1.0, 1.1], 0.5, 10, 0)).toMatchObject({ groupValue: null, weight: 0, suggested: 1.05 })
  })

  it('counts projects, not braces, for the weight', () => {
    // Three braces of ONE project: n = 1 project → w = 1/2 with a threshold of 2.
    const c: FactorColumns = { projectId: [7, 7, 7, 8], yearDesigned: [2020, 2020, 2020, 2020], yearCompleted: [NaN, NaN, NaN, NaN], assumed: [1, 1, 1, 1], final: [1.2, 1.2, 1.2, 1.0] }
    const s = suggestStarting(c, [0, 1, 2], [0, 1, 2, 3], { quantity: 'beta', basis: 'b', quantile: 0.9, minGroupSize: 2, habitYears: 3 })
    // group P90 = 1.2; firm finals 1.0, 1.2, 1.2, 1.2: P90 h = 2.7 → 1.2; suggested 1.2 whatever the weight.
    expect(s.groupSize).toBe(1)
    expect(s.weight).toBe(0.5)
    expect(s.suggested).toBeCloseTo(1.2, 12)
  })
})

describe('starting suggestion', () => {
  it('quantile of comparable finals, habit, and how each would have fared', () => {
    const s = suggestStarting(cols, group, firm, { quantity: 'beta', basis: '2.0×Δbm · AISC 341-16', quantile: 0.9, minGroupSize: 2, habitYears: 2 })
    // 4 projects ≥ 2 → w = 1, suggested = group P90 = 1.285 (worked above).
    expect(s.shrunk).toBe(false)
    expect(s.suggested).toBeCloseTo(1.285, 12)
    // Habit: latest group year 2013, habitYears 2 → years 2012 and 2013: assumed 1.15 (row 2) and 1.20 (row 4) → median 1.175.
    expect(s.habit).toBeCloseTo(1.175, 12)
    // Against the group finals 1.20, 1.10, 1.30, 1.25: above 1.285 only 1.30 → 1/4; above 1.175: 1.20, 1.30, 1.25 → 3/4.
    expect(s.underestimateRateSuggested).toBe(0.25)
    expect(s.underestimateRateHabit).toBe(0.75)
    // Mean conservatism of 1.285: (1.285/1.2 + 1.285/1.1 + 1.285/1.3 + 1.285/1.25)/4 − 1.
    const mc = (1.285 / 1.2 + 1.285 / 1.1 + 1.285 / 1.3 + 1.285 / 1.25) / 4 - 1
    expect(s.meanConservatismSuggested).toBeCloseTo(mc, 12)
    expect(s.rule).toMatch(/P90/)
  })

  it('the two-sided stiffness factor takes the median and says so', () => {
    const s = suggestStarting(cols, group, firm, { quantity: 'stiffness', basis: 'AISC 341-16', quantile: 0.9, minGroupSize: 2, habitYears: 2 })
    // Group finals 1.10, 1.20, 1.25, 1.30: median h = 1.5 → 1.225.
    expect(s.suggested).toBeCloseTo(1.225, 12)
    expect(s.rule).toMatch(/Median/)
  })

  it('habit leaves out rows without a year designed, and is null when no row has one', () => {
    // The hand-made history above with project 5's design year unknown: the latest known year is 2012,
    // so a 2-year habit takes years > 2010: rows 1 (2011, 1.10) and 2 (2012, 1.15) → median 1.125.
    const noYear: FactorColumns = { ...cols, yearDesigned: Float64Array.from(cols.yearDesigned, (y, i) => (i === 4 ? NaN : y)) }
    expect(habitOf(noYear, [0, 1, 2, 4], 2)).toBeCloseTo(1.125, 10)
    expect(habitOf({ ...cols, yearDesigned: new Float64Array(5).fill(NaN) }, [0, 1, 2, 4], 3)).toBeNull()
  })

  it('habit is null and scores are zero for an empty group', () => {
    expect(habitOf(cols, [], 3)).toBeNull()
    expect(scoreValue(1, [])).toEqual({ underestimateRate: 0, meanConservatism: 0 })
  })
})

describe('back-test: trained only on projects finished before the year', () => {
  /**
   * row  project  designed  completed  assumed  final   in group
   *  0      1       2010      2011       1.10    1.20      yes
   *  1      2       2011      —          1.10    1.10      yes   (completion missing → finished 2011, its design year)
   *  2      3       2009      2010       1.10    1.40      no    (firm only)
   *  3      4       2012      2013       1.15    1.30      yes
   *  4      5       2013      2014       1.20    1.12      yes
   * Median rule (p = 0.5), threshold 4 projects.
   */
  const bt: FactorColumns = {
    projectId: [1, 2, 3, 4, 5],
    yearDesigned: [2010, 2011, 2009, 2012, 2013],
    yearCompleted: [2011, NaN, 2010, 2013, 2014],
    assumed: [1.1, 1.1, 1.1, 1.15, 1.2],
    final: [1.2, 1.1, 1.4, 1.3, 1.12],
  }
  const years = backtest(bt, [0, 1, 3, 4], [0, 1, 2, 3, 4], { quantity: 'beta', quantile: 0.5, minGroupSize: 4 })

  it('skips years with nothing finished before them', () => {
    // 2010: nothing finished before 2010 (row 2 finished in 2010, not before) → skipped.
    expect(years.map(y => y.year)).toEqual([2011, 2012, 2013])
  })

  it('2011: only the firm-wide project finished → w = 0, the firm value', () => {
    // Finished < 2011: row 2 only → firm median 1.40, group empty → suggested 1.40, trained on 1 project.
    // Scored on row 1 (final 1.10): not above 1.40 → 0; conservatism 1.40/1.10 − 1 = 0.272727…
    // What was assumed: 1.10 vs 1.10 → not an underestimate; conservatism 0.
    expect(years[0]).toMatchObject({ year: 2011, projects: 1, braces: 1, trainedOn: 1, suggestedUnderestimateRate: 0, habitUnderestimateRate: 0 })
    expect(years[0]!.suggested).toBeCloseTo(1.4, 12)
    expect(years[0]!.suggestedMeanConservatism).toBeCloseTo(1.4 / 1.1 - 1, 12)
    expect(years[0]!.habitMeanConservatism).toBeCloseTo(0, 12)
  })

  it('2012 and 2013: shrunk with w = 2/4 and scored against the assumed values', () => {
    // Finished < 2012: rows 2, 0, 1 → firm median of 1.10, 1.20, 1.40 = 1.20; group 1.10, 1.20 → 1.15;
    // 2 group projects / 4 → w = 0.5 → 0.5·1.15 + 0.5·1.20 = 1.175 (trained on the 3 firm projects).
    // 2012, row 3 (final 1.30): above 1.175 → rate 1, conservatism 1.175/1.30 − 1; assumed 1.15 → rate 1, 1.15/1.30 − 1.
    expect(years[1]).toMatchObject({ year: 2012, trainedOn: 3, suggestedUnderestimateRate: 1, habitUnderestimateRate: 1 })
    expect(years[1]!.suggested).toBeCloseTo(1.175, 12)
    expect(years[1]!.suggestedMeanConservatism).toBeCloseTo(1.175 / 1.3 - 1, 12)
    expect(years[1]!.habitMeanConservatism).toBeCloseTo(1.15 / 1.3 - 1, 12)
    // 2013: row 3 finished in 2013, not before → same training, 1.175; row 4 (final 1.12) → rate 0 for both,
    // conservatism 1.175/1.12 − 1 and 1.20/1.12 − 1.
    expect(years[2]!.suggested).toBeCloseTo(1.175, 12)
    expect(years[2]).toMatchObject({ year: 2013, suggestedUnderestimateRate: 0, habitUnderestimateRate: 0 })
    expect(years[2]!.suggestedMeanConservatism).toBeCloseTo(1.175 / 1.12 - 1, 12)
    expect(years[2]!.habitMeanConservatism).toBeCloseTo(1.2 / 1.12 - 1, 12)
  })
})
