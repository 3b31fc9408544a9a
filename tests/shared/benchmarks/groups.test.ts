import { describe, expect, it } from 'vitest'
import { buildGroups, lateralTons, metricBands, projectMetrics, proposalFor, proposalFromGroup, proposalGroup, proposalGroupKey, publishGroup, type BenchmarkProject } from '@shared/benchmarks/groups'
import { BENCHMARK_METRICS, SUPPRESSED_MESSAGE } from '@shared/schemas/benchmarks'
import { percentileBand } from '@shared/benchmarks/percentiles'
import { rng } from '../../../scripts/bench/synthetic'

function project(over: Partial<BenchmarkProject> = {}): BenchmarkProject {
  return {
    code: 'P-1',
    name: 'Building 1',
    clientConfidential: false,
    benchmarkPermitted: true,
    buildingUse: 'office',
    stories: 4,
    sdc: 'D',
    region: 'Region 1',
    yearDesigned: 2019,
    floorAreaFt2: 40_000,
    frames: 4,
    baseShearKip: 800,
    totalCoreAreaIn2: 100,
    tonnage: { preliminary: { lateral_total: 36, structural_total: 220 }, final: { lateral_total: 40, structural_total: 200, braces: 5 } },
    ...over,
  }
}

describe('projectMetrics', () => {
  it('computes each figure in US units (hand-worked)', () => {
    const m = projectMetrics(project(), 'us')
    expect(m.lateralPerFloorArea).toBeCloseTo(2.0, 12) // 40 ton × 2000 lb / 40 000 ft²
    expect(m.structuralPerFloorArea).toBeCloseTo(10.0, 12) // 200 × 2000 / 40 000
    expect(m.lateralPerFrame).toBeCloseTo(10, 12) // 40 / 4 frame lines
    expect(m.lateralPerStory).toBeCloseTo(10, 12) // 40 / 4 stories
    expect(m.lateralPerBaseShear).toBeCloseTo(0.05, 12) // 40 / 800 kip
    expect(m.bracePerCoreArea).toBeCloseTo(100, 12) // 5 × 2000 lb / 100 in²
    expect(m.lateralEstimateSpread).toBeCloseTo(40 / 36 - 1, 12) // +11.1 %
    expect(m.structuralEstimateSpread).toBeCloseTo(200 / 220 - 1, 12) // −9.1 %
  })

  it('converts to SI with factors matching NIST SP 811 Appendix B', () => {
    const m = projectMetrics(project(), 'si')
    // NIST SP 811 B.8: pound per square foot = 4.882428 kg/m² → 2.0 lb/ft² = 9.764856 kg/m²
    expect(m.lateralPerFloorArea).toBeCloseTo(2.0 * 4.882428, 5)
    // NIST SP 811 B.8: ton, short (2000 lb) = 9.071847 E+02 kg → 10 short tons = 9.071847 t
    expect(m.lateralPerFrame).toBeCloseTo(9.071847, 6)
    // NIST SP 811 B.8: kip (1000 lbf) = 4.448222 E+03 N → 0.05 ton/kip = 0.05 × 0.9071847 / 4.448222 tonne/kN
    expect(m.lateralPerBaseShear).toBeCloseTo((0.05 * 0.9071847) / 4.448222, 7)
    // NIST SP 811 B.8: pound = 0.4535924 kg; square inch = 6.4516 E−04 m² → 100 lb/in² = 45.35924 kg / 645.16 mm²
    expect(m.bracePerCoreArea).toBeCloseTo(45.35924 / 645.16, 7)
    // A spread is a ratio: the same in either system.
    expect(m.lateralEstimateSpread).toBeCloseTo(40 / 36 - 1, 12)
  })

  it('gives null for a figure whose inputs are missing', () => {
    const m = projectMetrics(project({ floorAreaFt2: null, baseShearKip: null, totalCoreAreaIn2: null, tonnage: { preliminary: {}, final: { lateral_total: 40 } } }), 'us')
    expect(m.lateralPerFloorArea).toBeNull()
    expect(m.lateralPerBaseShear).toBeNull()
    expect(m.bracePerCoreArea).toBeNull()
    expect(m.lateralEstimateSpread).toBeNull()
    expect(m.lateralPerFrame).toBeCloseTo(10, 12)
  })

  it('sums the four lateral categories only when lateral_total is absent and all four exist', () => {
    expect(lateralTons({ lateral_total: 12, braces: 1 })).toBe(12)
    expect(lateralTons({ braces: 1, beams: 2, columns: 3, connections: 0.5 })).toBe(6.5)
    expect(lateralTons({ braces: 1, beams: 2 })).toBeNull()
  })
})

describe('publishGroup / buildGroups', () => {
  const members = [1, 2, 3, 4].map(i => project({ code: `P-${i}`, name: `Building ${i}`, clientConfidential: i === 2, benchmarkPermitted: i !== 2 && i !== 3 }))

  it('suppresses a group of fewer than five projects for business development, with no figures or names', () => {
    const g = publishGroup('office', members, 'us', 'bd')
    expect(g).toEqual({ key: 'office', n: null, suppressed: true, message: SUPPRESSED_MESSAGE })
    expect(SUPPRESSED_MESSAGE).toBe('too few projects to publish')
  })

  it('publishes the same group to a principal, naming every project', () => {
    const g = publishGroup('office', members, 'us', 'analyst')
    expect(g.suppressed).toBe(false)
    expect(g.metrics!.lateralPerFloorArea!.p50).toBeCloseTo(2, 12)
    expect(g.projects!.map(p => p.code)).toEqual(['P-1', 'P-2', 'P-3', 'P-4'])
  })

  it('names to business development only projects that are not confidential and are benchmark-permitted', () => {
    const five = [...members, project({ code: 'P-5', name: 'Building 5' })]
    const g = publishGroup('office', five, 'us', 'bd')
    expect(g.n).toBe(5)
    expect(g.projects!.map(p => p.code)).toEqual(['P-1', 'P-4', 'P-5'])
  })

  it('orders height bands low to high with unknown last', () => {
    const ps = [project({ stories: 14 }), project({ stories: 2 }), project({ stories: null }), project({ stories: 9 }), project({ stories: 5 })]
    expect(buildGroups(ps, 'heightBand', 'us', 'analyst').map(g => g.key)).toEqual(['1–3 stories', '4–7 stories', '8–12 stories', '13+ stories', 'unknown'])
  })
})

describe('proposalFor', () => {
  // Six office projects of 2 stories with lateral steel 1.0 … 3.5 lb/ft² (20 … 70 tons on 40 000 ft²); three of them SDC D.
  const office = [20, 30, 40, 50, 60, 70].map((t, i) => project({ code: `O-${i}`, stories: 2, sdc: i < 3 ? 'D' : 'C', tonnage: { preliminary: {}, final: { lateral_total: t } } }))

  it('widens from use + band + SDC to use + band when the narrower group has fewer than five, and scales by floor area', () => {
    const r = proposalFor(office, { use: 'office', stories: 3, floorArea: 100_000, sdc: 'D', units: 'us' })
    expect(r.widened).toEqual(['use office, heightBand 1–3 stories, sdc D'])
    expect(r.group).toEqual({ criteria: { use: 'office', heightBand: '1–3 stories' }, n: 6 })
    // type 7, n = 6, h = 5p: P25 h=1.25 → 1.5 + 0.25·0.5 = 1.625; P50 h=2.5 → 2.25; P75 h=3.75 → 2.875 lb/ft²
    // × 100 000 ft² / 2000 lb per ton → 81.25, 112.5, 143.75 tons
    expect(r.expectedLateral!.low).toBeCloseTo(81.25, 10)
    expect(r.expectedLateral!.median).toBeCloseTo(112.5, 10)
    expect(r.expectedLateral!.high).toBeCloseTo(143.75, 10)
    expect(r.expectedLateral!.unit).toBe('ton')
  })

  it('gives tonnes in SI: kg/m² × m² / 1000', () => {
    // 2.25 lb/ft² × 4.882428 kg/m² per lb/ft² (NIST SP 811) × 10 000 m² / 1000 kg/t = 109.85 t
    const r = proposalFor(office, { use: 'office', stories: 2, floorArea: 10_000, units: 'si' })
    expect(r.expectedLateral!.median).toBeCloseTo((2.25 * 4.882428 * 10_000) / 1000, 3)
    expect(r.perFloorAreaUnit).toBe('kg/m²')
  })

  it('gives the same answer from a comparison group kept for another building with the same key (only the floor area differs)', () => {
    const first = { use: 'office', stories: 3, floorArea: 100_000, sdc: 'D', units: 'us' } as const
    const group = proposalGroup(office, first)
    // Two stories and three are one height band (1–3 stories): the same group key, another floor area.
    const second = { use: 'office', stories: 2, floorArea: 37_500, sdc: 'D', units: 'us' } as const
    expect(proposalGroupKey(second)).toBe(proposalGroupKey(first))
    expect(proposalFromGroup(second, group)).toEqual(proposalFor(office, second))
    // 2.25 lb/ft² median (above) × 37 500 ft² / 2000 lb per ton
    expect(proposalFromGroup(second, group).expectedLateral!.median).toBeCloseTo(42.1875, 10)
    // A different SDC, band, units or use is another key.
    for (const other of [{ ...first, sdc: 'C' as const }, { ...first, stories: 4 }, { ...first, units: 'si' as const }, { ...first, use: 'school' as const }]) expect(proposalGroupKey(other)).not.toBe(proposalGroupKey(first))
    // Callers may change the answer they get without changing the kept group.
    const answer = proposalFromGroup(second, group)
    answer.widened.push('changed')
    answer.group!.criteria.use = 'changed'
    expect(proposalFromGroup(second, group)).toEqual(proposalFor(office, second))
  })

  it('gives no benchmark when even all projects are fewer than five', () => {
    const r = proposalFor(office.slice(0, 4), { use: 'office', stories: 2, floorArea: 1000, units: 'us' })
    expect(r.group).toBeNull()
    expect(r.expectedLateral).toBeNull()
  })
})

// metricBands gathers each metric's finite values into a typed array; it must give exactly what
// percentileBand (tested against hand-worked type-7 values in percentiles.test.ts) gives on the
// metric's values as they are, missing ones included.
describe('metricBands', () => {
  it('equals percentileBand of each metric, for random groups with missing figures and ties', () => {
    const rand = rng(2024)
    const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
    const maybe = <T>(v: T) => (rand() < 0.15 ? null : v)
    let bands = 0
    for (const n of [0, 1, 2, 9, 300]) {
      const members = Array.from({ length: n }, (_, i) =>
        project({
          code: `P-${i}`,
          stories: maybe(1 + Math.floor(rand() * 25)),
          floorAreaFt2: maybe(pick([20_000, 40_000, 40_000, 55_000 + Math.round(rand() * 1e5)])),
          frames: 1 + Math.floor(rand() * 6),
          baseShearKip: maybe(Math.round(rand() * 20) * 100),
          totalCoreAreaIn2: maybe(Math.round(rand() * 50) * 10),
          tonnage: {
            preliminary: rand() < 0.2 ? {} : { lateral_total: Math.round(rand() * 40) + 10, structural_total: Math.round(rand() * 300) + 50 },
            final: rand() < 0.15 ? { braces: 3 } : { lateral_total: Math.round(rand() * 40) + 10, structural_total: Math.round(rand() * 300) + 50, braces: Math.round(rand() * 10) },
          },
        }),
      )
      for (const units of ['us', 'si'] as const) {
        const got = metricBands(members, units)
        for (const k of BENCHMARK_METRICS) {
          const want = percentileBand(members.map(m => projectMetrics(m, units)[k]))
          expect(got[k], `${n} projects, ${units}, ${k}`).toEqual(want)
          if (want) bands++
        }
      }
    }
    expect(bands).toBeGreaterThan(40) // not vacuous: most metrics of most groups have figures
  })
})
