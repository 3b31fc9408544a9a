import { describe, expect, it } from 'vitest'
import { STARTING_QUANTITIES } from '@shared/schemas/calibration'
import { backtest, quantileOfSorted, suggestStarting, type FactorColumns } from '@shared/calibration'
import { backtestIndexed, drain, groupSortedFinals, layoutSteps, quantileBy, quantityIndexSteps, startingIndex, startingLayout, startingQuantityIndex } from '../../api/src/services/calibration/starting-index'
import type { PhaseData } from '../../api/src/services/calibration/store'
import { rng } from '../../scripts/bench/synthetic'
import { syntheticPhase } from '../../scripts/bench/synthetic-phase'

// The starting-factor answers worked out on the per-version index (sorted firm rows, Fenwick
// order statistics for the back-test's growing pools) must equal, value for value, what the
// straightforward `suggestStarting` / `backtest` of shared/calibration/starting.ts give on the same
// rows (their own tests check those against worked examples). Random histories, with ties, missing
// completion years and a missing design year, exercise the edge cases.


/** A phase's columns: `projects` projects of 1–12 braces, two bases per quantity, finals rounded (ties). */
function history(seed: number, projects: number, missingDesignYear: boolean): PhaseData {
  const rand = rng(seed)
  const project: number[] = []
  const yd: number[] = []
  const yc: number[] = []
  for (let p = 0; p < projects; p++) {
    const year = missingDesignYear && p === 3 ? NaN : 2005 + Math.floor(rand() * 18)
    const done = rand() < 0.25 ? NaN : year + Math.floor(rand() * 4)
    const braces = 1 + Math.floor(rand() * 12)
    for (let b = 0; b < braces; b++) {
      project.push(p)
      yd.push(year)
      yc.push(done)
    }
  }
  const n = project.length
  const q = {} as PhaseData['q']
  for (const quantity of STARTING_QUANTITIES) {
    const assumed = new Float64Array(n).fill(NaN)
    const final = new Float64Array(n).fill(NaN)
    const basis = new Int32Array(n).fill(-1)
    for (let i = 0; i < n; i++) {
      if (rand() < 0.1) continue // no pair for this quantity
      basis[i] = rand() < 0.7 ? 0 : 1
      final[i] = Math.round((1 + rand()) * 20) / 20
      assumed[i] = Math.round((1 + rand()) * 20) / 20
    }
    q[quantity] = { assumed, final, basis, bases: ['basis A', 'basis B'] }
  }
  return { n, project: Int32Array.from(project), yearDesigned: Float64Array.from(yd), yearCompleted: Float64Array.from(yc), q } as unknown as PhaseData
}

describe('starting factors on the per-version index', () => {
  for (const [seed, projects, missing] of [
    [1, 40, false],
    [2, 120, true],
    [3, 7, false],
  ] as const) {
    it(`equal suggestStarting and backtest (history ${seed}: ${projects} projects${missing ? ', one without a design year' : ''})`, () => {
      const d = history(seed, projects, missing)
      const ix = startingIndex(d)
      const rand = rng(seed + 100)
      let compared = 0
      for (let trial = 0; trial < 12; trial++) {
        // A group: a random subset of projects (about a third), or none at all.
        const inProject = Array.from({ length: projects }, () => rand() < 0.35)
        if (trial === 0) inProject.fill(false)
        // Project 3 of history 2 has no design year: it stays firm-only (in a group, the existing
        // habitOf has no recent rows and throws, on either path).
        if (missing) inProject[3] = false
        const inGroup = new Uint8Array(d.n)
        for (let r = 0; r < d.n; r++) inGroup[r] = Number(inProject[d.project[r]!])
        const quantile = [0.5, 0.75, 0.9, 0.95][trial % 4]!
        for (const quantity of STARTING_QUANTITIES) {
          const { cols, bases } = ix[quantity]
          const projectId = Int32Array.from(d.project)
          const plain: FactorColumns = { projectId, yearDesigned: d.yearDesigned, yearCompleted: d.yearCompleted, assumed: d.q[quantity].assumed, final: d.q[quantity].final }
          for (const [b, firm] of bases) {
            const firmRows = [...Array(d.n).keys()].filter(r => d.q[quantity].basis[r] === b)
            const groupRows = firmRows.filter(r => inGroup[r])
            expect([...firm.rows]).toEqual(firmRows)
            const o = { quantity, basis: `basis ${b}`, quantile, minGroupSize: 8, habitYears: 3 }
            const expected = suggestStarting(plain, groupRows, firmRows, o)
            expect(suggestStarting(cols, groupRows, firm.rows, o, firm.sorted, groupSortedFinals(firm, inGroup, groupRows.length))).toEqual(expected)
            const bt = backtest(plain, groupRows, firmRows, { quantity, quantile, minGroupSize: 8 })
            expect(backtestIndexed(cols, firm, groupRows, inGroup, { quantity, quantile, minGroupSize: 8 })).toEqual(bt)
            compared += bt.length
          }
        }
      }
      // The comparison covered real back-test years, not only empty answers.
      expect(compared).toBeGreaterThan(50)
    })
  }
})

describe('the index built step by step (as a background build does)', () => {
  it('yields after grouping the rows and after each basis, and builds what the one-shot build does', () => {
    const steps = quantityIndexSteps(history(4, 60, false), 'beta')
    let yields = 0
    let r = steps.next()
    for (; !r.done; r = steps.next()) yields++
    // Two bases in this history: one yield after grouping, one after each basis.
    expect(yields).toBe(3)
    const once = startingQuantityIndex(history(4, 60, false), 'beta')
    expect([...r.value.bases.keys()].sort()).toEqual([0, 1])
    for (const b of [0, 1]) {
      const a = r.value.bases.get(b)!
      const o = once.bases.get(b)!
      expect(Array.from(a.byValue)).toEqual(Array.from(o.byValue))
      expect(Array.from(a.finalValues)).toEqual(Array.from(o.finalValues))
      expect(Array.from(a.firmProjectsAt)).toEqual(Array.from(o.firmProjectsAt))
    }
  })

  it('builds the layout in parts: before each partition, after its canonical order, after each member and after its runs', () => {
    const d = syntheticPhase(6, 60)
    const steps = layoutSteps(d)
    let yields = 0
    let r = steps.next()
    for (; !r.done; r = steps.next()) yields++
    const parts = r.value.partitions
    expect(parts.length).toBeGreaterThan(0)
    expect(yields).toBe(parts.reduce((n, p) => n + 1 + 1 + p.Q + 1, 0))
    // The layout a request asks for afterwards is the one the steps built.
    expect(startingLayout(d)).toBe(r.value)
  })

  it('keeps the part a request built while the background build was half way, and that one only', () => {
    const d = history(5, 30, false)
    const steps = quantityIndexSteps(d, 'omega')
    steps.next()
    steps.next()
    // A request needs the part now: it builds it at once.
    const byRequest = startingQuantityIndex(d, 'omega')
    expect(drain(steps)).toBe(byRequest)
    expect(startingQuantityIndex(d, 'omega')).toBe(byRequest)
    expect(startingIndex(d).omega).toBe(byRequest)
  })
})

describe('quantileBy', () => {
  it('equals quantileOfSorted on the whole sorted array, reading only through the accessor', () => {
    const rand = rng(9)
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(rand() * 40)
      const sorted = Float64Array.from({ length: n }, () => Math.round(rand() * 50) / 10).sort()
      const k = Math.floor(rand() * n)
      for (const p of [0, 1, 0.5, 0.9, rand(), n > 1 ? k / (n - 1) : 0]) {
        let reads = 0
        const got = quantileBy(n, p, i => {
          reads++
          expect(i).toBeGreaterThanOrEqual(0)
          expect(i).toBeLessThan(n)
          return sorted[i]!
        })
        expect(got).toBe(quantileOfSorted(sorted, p))
        expect(reads).toBeLessThanOrEqual(2)
      }
    }
    // An empty sequence and an out-of-range p fail as quantileOfSorted does.
    expect(() => quantileBy(0, 0.5, () => 0)).toThrow(/at least one/)
    expect(() => quantileBy(3, 1.5, () => 0)).toThrow(/between 0 and 1/)
  })
})
