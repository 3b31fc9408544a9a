import { tableFromIPC } from 'apache-arrow'
import { describe, expect, it } from 'vitest'
import { CALIBRATION_GROUPINGS, CALIBRATION_QUANTITIES, MISS_SORTS } from '@shared/schemas/calibration'
import type { TonnageByCategory } from '@shared/calibration'
import { costAnswer, missesAnswer, pointRowsOf, selection, startingAnswer, summaryAnswer, trendAnswer } from '../../api/src/services/calibration/derived'
import { pointsArrow } from '../../api/src/services/calibration/points'
import { refCost, refMisses, refPointRows, refPointsArrow, refStarting, refSummary, refTrend } from '../../api/src/services/calibration/reference'
import { selectRows } from '../../api/src/services/calibration/store'
import { randomFilters, randomStartingQuery } from '../../scripts/bench/analytics-cold'
import { rng } from '../../scripts/bench/synthetic'
import { syntheticPhase } from '../../scripts/bench/synthetic-phase'

// The analytics answers computed on the per-version structures of derived.ts (presorted ratio
// orders, sorted views, per-value filter tables, per-sort miss orders) must equal, value for value
// and in the same order, the straightforward computation of reference.ts (select, group, sort per
// query — the code the analytics ran before), and the row selection must equal store.ts's
// selectRows. Random histories (seeded) with tied values, missing years / suppliers / core areas,
// interleaved projects and brace ids out of row order, and random filter combinations.

/** Runs f, turning a thrown error into a value, so "both throw the same" also counts as equal. */
const outcome = <T>(f: () => T): T | { error: string } => {
  try {
    return f()
  } catch (e) {
    return { error: String(e) }
  }
}

const HISTORIES = [
  [1, 150, 40],
  [2, 400, 12],
  [3, 30, 60],
  [4, 1, 5],
] as const

describe('derived analytics equal the reference computation', () => {
  for (const [seed, projects, maxBraces] of HISTORIES) {
    it(`history ${seed}: ${projects} projects of up to ${maxBraces} braces`, () => {
      const d = syntheticPhase(seed, projects, maxBraces)
      const rand = rng(seed * 31 + 5)
      const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
      const tonnage = new Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>()
      for (const id of d.projects.id) if (rand() < 0.8) tonnage.set(id, { preliminary: { lateral_total: 100 + Math.round(rand() * 50) }, final: rand() < 0.5 ? { beams: 20 + rand() * 10, columns: 30 } : { lateral_total: 90 } })
      let nonEmpty = { selection: 0, summary: 0, trend: 0, misses: 0, cost: 0 }
      for (let trial = 0; trial < 30; trial++) {
        const f = trial === 0 ? { phase: 'sd' as const } : randomFilters(d, rand)
        const sel = selection(d, f)
        const rows = selectRows(d, f)
        expect(Array.from(sel.rows)).toEqual(Array.from(rows))
        expect(sel.mask.reduce((a, b) => a + b, 0)).toBe(rows.length)
        if (rows.length) nonEmpty.selection++

        const quantity = pick(CALIBRATION_QUANTITIES)
        const groupBy = pick(CALIBRATION_GROUPINGS)
        const tolerance = pick([0.05, 0.1, 0.25])
        const summary = outcome(() => summaryAnswer(d, f, quantity, groupBy, tolerance))
        expect(summary).toEqual(outcome(() => refSummary(d, f, quantity, groupBy, tolerance)))
        if ('groups' in summary && summary.groups.length) nonEmpty.summary++

        const trend = trendAnswer(d, f, quantity)
        expect(trend).toEqual(refTrend(d, f, quantity))
        if (trend.years.length) nonEmpty.trend++

        for (const sort of MISS_SORTS) {
          const q = { sort, dir: pick(['asc', 'desc'] as const), limit: pick([1, 7, 25, 1000]) }
          const misses = missesAnswer(d, f, quantity, q, tolerance)
          expect(misses).toEqual(refMisses(d, f, quantity, q, tolerance))
          if (misses.length) nonEmpty.misses++
        }

        const cost = costAnswer(d, f, tonnage)
        expect(cost).toEqual(refCost(d, f, tonnage))
        if (cost.projects.length) nonEmpty.cost++

        const pts = pointRowsOf(d, f, quantity, groupBy)
        const refPts = refPointRows(d, f, quantity, groupBy)
        expect(Array.from(pts.rows)).toEqual(Array.from(refPts.rows))
        expect(Array.from(pts.group)).toEqual(Array.from(refPts.group))
        expect(pts.groups).toEqual(refPts.groups)
        // Arrow dictionary ids are a process-wide counter, so compare the decoded streams.
        const a = tableFromIPC(pointsArrow(pts))
        const b = tableFromIPC(refPointsArrow(refPts))
        expect(a.schema.fields.map(x => `${x.name}:${x.type}`)).toEqual(b.schema.fields.map(x => `${x.name}:${x.type}`))
        expect(a.schema.metadata.get('quantity')).toBe(quantity)
        for (const x of b.schema.fields) expect(Array.from(a.getChild(x.name)!.toArray() as ArrayLike<unknown>)).toEqual(Array.from(b.getChild(x.name)!.toArray() as ArrayLike<unknown>))

        const sq = randomStartingQuery(d, rand)
        const settings = { minGroupSize: pick([1, 5, 12]), habitYears: pick([1, 5]) }
        expect(outcome(() => startingAnswer(d, sq, settings))).toEqual(outcome(() => refStarting(d, sq, settings)))
      }
      // The comparisons were not vacuous (the one-project history may legitimately be sparse).
      if (projects > 1) for (const v of Object.values(nonEmpty)) expect(v).toBeGreaterThan(10)
      nonEmpty = { selection: 0, summary: 0, trend: 0, misses: 0, cost: 0 }
    })
  }
})
