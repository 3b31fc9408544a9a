import type { BacktestYear } from '@shared/schemas/calibration'
import { palette } from '../theme'
import type { LineSeries } from './line-chart'

/**
 * The starting-factor back-test as chart series: by year, the rate of braces the suggestion would
 * have missed against the rate the firm's habit missed, and the mean conservatism of each. The
 * suggestion is solid teal, the habit dashed amber (dash and colour both tell them apart).
 */
export function backtestSeries(years: readonly BacktestYear[]): {
  rates: LineSeries[]
  conservatism: LineSeries[]
  legend: { key: string; label: string; color: string; dashed?: boolean }[]
} {
  const sorted = [...years].sort((a, b) => a.year - b.year)
  const suggested = { key: 'suggested', label: 'Suggestion', color: palette.steel700 }
  const habit = { key: 'habit', label: 'Firm’s habit', color: palette.amber600, dashed: true }
  return {
    rates: [
      { ...suggested, points: sorted.map(y => ({ x: y.year, y: y.suggestedUnderestimateRate })) },
      { ...habit, points: sorted.map(y => ({ x: y.year, y: y.habitUnderestimateRate })) },
    ],
    conservatism: [
      { ...suggested, points: sorted.map(y => ({ x: y.year, y: y.suggestedMeanConservatism })) },
      { ...habit, points: sorted.map(y => ({ x: y.year, y: y.habitMeanConservatism })) },
    ],
    legend: [suggested, habit],
  }
}
