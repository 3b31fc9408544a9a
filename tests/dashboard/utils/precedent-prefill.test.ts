import { describe, expect, it } from 'vitest'
import type { PrecedentMatch } from '@shared/schemas/precedents'
import { descriptionFromWorksheet, precedentPrefill } from '../../../dashboard/src/utils/precedent-prefill'
import { applyWorksheetPrefill } from '../../../dashboard/src/utils/worksheet-prefill'
import { createLevelRow, createWorksheetForm } from '../../../dashboard/src/utils/worksheet-form'

// An invented three-story precedent, levels given out of order: 30 ft bay (360 in), stories 15, 13, 13 ft.
const match: PrecedentMatch = {
  rank: 1,
  code: 'P-100',
  name: 'Invented Annex',
  frameLine: 'B',
  yearDesigned: 2021,
  configuration: 'two_story_x',
  bays: 2,
  bayWidthIn: 360,
  similarity: 0.8,
  distance: 0.22,
  breakdown: [],
  levels: [
    { level: 'Roof', levelIndex: 3, storyHeightIn: 156, storyShearKip: 170, preliminaryCoreAreaIn2: 3, finalCoreAreaIn2: 3.5, assumed: { beta: 1.1, omega: 1.4, stiffnessFactor: 1.4 }, final: { beta: 1.12, omega: 1.38, stiffnessFactor: 1.3, factorDriftMultiple: 2 } },
    { level: 'L2', levelIndex: 1, storyHeightIn: 180, storyShearKip: 420, preliminaryCoreAreaIn2: 8, finalCoreAreaIn2: 8.5, assumed: { beta: 1.1, omega: 1.4, stiffnessFactor: 1.4 }, final: { beta: 1.15, omega: 1.45, stiffnessFactor: 1.36, factorDriftMultiple: 2 } },
    { level: 'L3', levelIndex: 2, storyHeightIn: 156, storyShearKip: 310, preliminaryCoreAreaIn2: 6, finalCoreAreaIn2: null, assumed: null, final: null },
  ],
  lateralLbPerFt2: 3.1,
  structuralLbPerFt2: 12,
}

describe('precedentPrefill(match)', () => {
  it('carries the geometry, the stories bottom first, and the governing final factors in US units', () => {
    const p = precedentPrefill(match)
    expect(p.units).toBe('us')
    expect(p.configuration).toBe('two_story_x')
    expect(p.bracedBays).toBe(2)
    expect(p.bayWidth).toBe(30) // 360 in / 12
    // Bottom first by level index; 180 in = 15 ft, 156 in = 13 ft.
    expect(p.levels).toEqual([
      { name: 'L2', storyHeight: 15, storyShear: 420 },
      { name: 'L3', storyHeight: 13, storyShear: 310 },
      { name: 'Roof', storyHeight: 13, storyShear: 170 },
    ])
    // Largest final β (1.15) and ω (1.45) of the levels with a final; median KF of 1.30 and 1.36 = 1.33.
    expect(p.basis).toEqual({ beta: 1.15, omega: 1.45, stiffnessFactor: 1.33 })
    expect(p.source).toBe('precedent P-100, frame line B')
  })

  it('applied to an SI worksheet, gives metres and kilonewtons', () => {
    const form = applyWorksheetPrefill(createWorksheetForm(undefined, 'si'), precedentPrefill(match))
    // 30 ft × 0.3048 = 9.144 m; 15 ft = 4.572 m; 420 kip × 4.4482216152605 = 1868.253 kN (exact definitions, NIST SP 811).
    expect(form.bayWidth).toBeCloseTo(9.144, 9)
    expect(form.levels[0]!.storyHeight).toBeCloseTo(4.572, 9)
    expect(form.levels[0]!.storyShear).toBeCloseTo(420 * 4.4482216152605, 4)
    expect(form.levels.map(l => l.name)).toEqual(['L2', 'L3', 'Roof'])
    expect(form.basis.beta).toBe(1.15)
    expect(form.configuration).toBe('two_story_x')
  })

  it('drops the float noise of stored values: the shortest decimal within 1e-6 relative', () => {
    const noisy = { ...match, levels: [{ ...match.levels[1]!, storyShearKip: 391.70035818864, storyHeightIn: 192.00000000000003 }] }
    // 391.70035818864 → 391.7: |391.7 − 391.70035818864| / 391.7 = 9.1e-7 ≤ 1e-6, and 391.7 is the shortest
    // such decimal (391 is 1.8e-3 off). 192.00000000000003 in / 12 = 16 ft.
    expect(precedentPrefill(noisy).levels).toEqual([{ name: 'L2', storyHeight: 16, storyShear: 391.7 }])
  })

  it('leaves the sizing basis alone when no level has a final value', () => {
    const bare = { ...match, levels: match.levels.map(l => ({ ...l, final: null })) }
    const p = precedentPrefill(bare)
    expect(p.basis).toBeUndefined()
    expect(p.what).toBe('Geometry, story heights and shears')
  })
})

describe('descriptionFromWorksheet(form)', () => {
  it('reads the first-story shear, the stories, the mean story height, the bay width and the configuration', () => {
    const form = {
      ...createWorksheetForm(undefined, 'us'),
      bayWidth: 30,
      levels: [createLevelRow(0, { storyHeight: 15, storyShear: 420 }), createLevelRow(1, { storyHeight: 13, storyShear: 310 }), createLevelRow(2, { storyHeight: 13, storyShear: 170 })],
    }
    // Mean story height (15 + 13 + 13) / 3 = 13.6667 ft.
    const d = descriptionFromWorksheet(form)
    expect(d).toMatchObject({ storyShear: 420, stories: 3, bayWidth: 30, configuration: 'inverted_v' })
    expect(d.storyHeight).toBeCloseTo(41 / 3, 5)
  })

  it('leaves out what the worksheet does not have yet', () => {
    const d = descriptionFromWorksheet(createWorksheetForm(undefined, 'us'))
    expect(d).toEqual({ configuration: 'inverted_v', stories: 3 })
  })
})
