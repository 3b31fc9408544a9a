import { tableFromIPC } from 'apache-arrow'
import { describe, expect, it } from 'vitest'
import { CALIBRATION_GROUPINGS, CALIBRATION_QUANTITIES, MISS_SORTS, STARTING_QUANTITIES } from '@shared/schemas/calibration'
import type { TonnageByCategory } from '@shared/calibration'
import { costAnswer, missesAnswer, pointRowsOf, preparationSteps, selection, sortedView, startingAnswer, summaryAnswer, tables, trendAnswer } from '../../api/src/services/calibration/derived'
import { dropStartingStats, startingAnswerIndexed } from '../../api/src/services/calibration/starting-index'
import { pointsArrow } from '../../api/src/services/calibration/points'
import { refCost, refMisses, refPointRows, refPointsArrow, refStarting, refSummary, refTrend } from '../../api/src/services/calibration/reference'
import { selectRows, type PhaseData } from '../../api/src/services/calibration/store'
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

/**
 * The history with every starting quantity on the first one's bases (the same basis code on every
 * row, as when the bases are code editions), so the app's path reads the quantities together;
 * values filled in (rounded, so they tie) where a quantity had none. A new object: nothing derived
 * from the original is shared.
 */
function sharedBases(d: PhaseData, seed: number): PhaseData {
  const rand = rng(seed)
  const basis = d.q[STARTING_QUANTITIES[0]].basis
  const q = { ...d.q }
  for (const quantity of STARTING_QUANTITIES) {
    const col = d.q[quantity]
    const assumed = Float64Array.from(col.assumed)
    const final = Float64Array.from(col.final)
    for (let i = 0; i < d.n; i++) {
      if (basis[i]! < 0) {
        assumed[i] = NaN
        final[i] = NaN
      } else if (!(final[i]! > 0)) {
        final[i] = Math.round((1 + rand() * 0.6) * 200) / 200
        assumed[i] = Math.round((1 + rand() * 0.6) * 200) / 200
      }
    }
    const bases = d.q[STARTING_QUANTITIES[0]].bases.map(b => `${quantity} ${b}`)
    q[quantity] = { assumed, final, basis: Int32Array.from(basis), bases }
  }
  return { ...d, q }
}

describe('starting factors on the cell layout equal the reference computation', () => {
  for (const [seed, projects, maxBraces] of HISTORIES.slice(0, 3)) {
    for (const shared of [false, true]) {
      it(`history ${seed}${shared ? ', quantities on shared bases' : ''}: several quantiles per filter set, with and without the kept group stats`, () => {
        const base = syntheticPhase(seed, projects, maxBraces)
        const d = shared ? sharedBases(base, seed + 7) : base
        const rand = rng(seed * 17 + 3)
        const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
        let years = 0
        for (let trial = 0; trial < 25; trial++) {
          const sq = trial === 0 ? { quantile: 0.9, supplier: 'no such supplier' } : randomStartingQuery(d, rand)
          const settings = { minGroupSize: pick([1, 5, 12]), habitYears: pick([1, 3, 5]) }
          // The first quantile reads the rows; the others reuse the group's kept stats.
          for (const quantile of [sq.quantile, 0.5, 0.77, 0.99]) {
            const q = { ...sq, quantile }
            const got = outcome(() => startingAnswer(d, q, settings))
            expect(got).toEqual(outcome(() => refStarting(d, q, settings)))
            if ('backtest' in got) years += Object.values(got.backtest).reduce((a, b) => a + b.length, 0)
          }
          // The same answer again after the kept stats are dropped (the rows are read again).
          dropStartingStats(d)
          expect(outcome(() => startingAnswer(d, sq, settings))).toEqual(outcome(() => refStarting(d, sq, settings)))
        }
        // Back-tests with years were compared, not only empty ones.
        expect(years).toBeGreaterThan(100)
      })
    }
  }

  it('the empty group falls back to the firm on every basis, as the reference does', () => {
    const d = syntheticPhase(5, 80, 20)
    const q = { quantile: 0.9, supplier: 'no such supplier' }
    const got = startingAnswer(d, q, { minGroupSize: 5, habitYears: 5 })
    expect(got).toEqual(refStarting(d, q, { minGroupSize: 5, habitYears: 5 }))
    expect(got.suggestions.length).toBeGreaterThan(STARTING_QUANTITIES.length)
    expect(got.suggestions.every(s => s.groupValue === null && s.groupSize === 0)).toBe(true)
  })

  it('refuses a project filter that is not on supplier and year designed (its cells would not be all in or all out)', () => {
    const d = syntheticPhase(6, 150, 20)
    expect(() => startingAnswerIndexed(d, tables(d, { use: ['office'] }), 0.9, { minGroupSize: 5, habitYears: 5 })).toThrow(/supplier and year designed/)
    expect(() => startingAnswerIndexed(d, tables(d, { supplier: ['BS-A'], yearFrom: 2010 }), 0.9, { minGroupSize: 5, habitYears: 5 })).not.toThrow()
  })
})

describe('the points as Arrow', () => {
  it('carry names outside ASCII and empty names byte for byte (the dictionary strings are laid out directly)', () => {
    const d = syntheticPhase(9, 30, 8)
    const names = ['Bâtiment Ørsted — 東棟', '', 'Quay 7 “north” wing', '🏗 Yard shed']
    names.forEach((name, j) => (d.projects.name[j] = name))
    const pts = pointRowsOf(d, {}, 'cmax', 'supplier')
    const a = tableFromIPC(pointsArrow(pts))
    const b = tableFromIPC(refPointsArrow(refPointRows(d, {}, 'cmax', 'supplier')))
    const decoded = Array.from(a.getChild('projectName')!.toArray() as ArrayLike<string>)
    expect(decoded).toEqual(Array.from(b.getChild('projectName')!.toArray() as ArrayLike<string>))
    // Each point's name is its project's, looked up directly in the columns.
    expect(decoded).toEqual(Array.from(pts.rows, r => d.projects.name[d.project[r]!]!))
    for (const name of names.slice(0, 2)) expect(decoded).toContain(name)
  })
})

describe('the ratio orders and sorted views built in parts (as a background build does)', () => {
  // preparationSteps: [group codes, then per quantity its ratio order and its sorted view, …].
  const quantities = (d: ReturnType<typeof syntheticPhase>) => Object.keys(d.q) as (typeof CALIBRATION_QUANTITIES)[number][]

  it('yields between parts and builds what the one-shot build does', () => {
    const d = syntheticPhase(7, 900, 200)
    expect(d.n).toBeGreaterThan(65_536 + 1000)
    const once = syntheticPhase(7, 900, 200)
    const steps = preparationSteps(d)
    steps[0]!()
    const q = quantities(d)[0]!
    const yieldsOf = (step: (typeof steps)[number]) => {
      const parts = step()
      expect(parts).toBeDefined()
      let yields = 0
      for (let r = parts!.next(); !r.done; r = parts!.next()) yields++
      return yields
    }
    // The order: after the ratios, after the rows that carry the quantity, after each radix pass that reorders (1–4).
    const orderYields = yieldsOf(steps[1]!)
    expect(orderYields).toBeGreaterThanOrEqual(3)
    expect(orderYields).toBeLessThanOrEqual(6)
    // The view (its order already built): before each part of 65,536 rows.
    expect(yieldsOf(steps[2]!)).toBe(Math.ceil(sortedView(d, q).rows.length / 65_536))
    expect(sortedView(d, q).rows.length).toBeGreaterThan(65_536)
    const view = sortedView(d, q)
    const fresh = sortedView(once, q)
    for (const k of ['rows', 'project', 'config', 'core', 'basis', 'ratio'] as const) expect(Array.from(view[k])).toEqual(Array.from(fresh[k]))
  })

  it('keeps the view a request built while the parts were half way', () => {
    const d = syntheticPhase(8, 300, 40)
    const steps = preparationSteps(d)
    const q = quantities(d)[0]!
    const parts = steps[2]!()!
    parts.next()
    const asked = sortedView(d, q)
    let r = parts.next()
    while (!r.done) r = parts.next()
    expect(r.value).toBe(asked)
    expect(sortedView(d, q)).toBe(asked)
  })
})
