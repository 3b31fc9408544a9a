import { describe, expect, it } from 'vitest'
import { sizeFrame } from '@shared/engineering/size-frame'
import { FALLBACK_SIZING_DEFAULTS, SizingDefaults } from '@shared/schemas/settings'
import {
  basisFromDefaults,
  basisToDefaults,
  convertValue,
  convertWorksheetForm,
  createLevelRow,
  createWorksheetForm,
  isFrameEmpty,
  maybeWorksheetForm,
  toSizingRequest,
  type WorksheetForm,
} from '../../../dashboard/src/utils/worksheet-form'

/** Our own invented frame: 3-story chevron, 28 ft bays, 2 braced bays. */
function usFrame(): WorksheetForm {
  const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'us')
  form.label = 'Grid 7'
  form.bayWidth = 28
  form.bracedBays = 2
  form.levels = [
    createLevelRow(0, { storyHeight: 15, storyShear: 260 }),
    createLevelRow(1, { storyHeight: 13, storyShear: 190 }),
    createLevelRow(2, { storyHeight: 13, storyShear: 105 }),
  ]
  return form
}

describe('convertWorksheetForm(form, units)', () => {
  // Exact bases: 1 ft = 0.3048 m, 1 kip = 4.4482216152605 kN, 1 ksi = 6.894757293168 MPa, 1 in² = 645.16 mm².
  it('converts lengths, shears, stresses and core steps from US to SI', () => {
    const si = convertWorksheetForm(usFrame(), 'si')
    expect(si.units).toBe('si')
    expect(si.bayWidth).toBe(8.5344) // 28 × 0.3048
    expect(si.levels[0]!.storyHeight).toBe(4.572) // 15 × 0.3048
    expect(si.levels[0]!.storyShear).toBeCloseTo(260 * 4.4482216152605, 4)
    expect(si.basis.fyscMin).toBe(262.000777) // 38 × 6.894757293168 = 262.000777140…, shortest decimal within 1e-9
    expect(si.basis.fyscMax).toBeCloseTo(46 * 6.894757293168, 4)
    expect(si.basis.coreSteps[0]).toEqual({ upTo: 3225.8, step: 161.29 }) // 5 in², 0.25 in²
    expect(si.basis.coreSteps.at(-1)!.upTo).toBeNull()
  })

  it('leaves names, counts and dimensionless factors alone', () => {
    const us = usFrame()
    const si = convertWorksheetForm(us, 'si')
    expect(si.bracedBays).toBe(2)
    expect(si.levels.map(l => l.name)).toEqual(['L1', 'L2', 'L3'])
    expect([si.basis.beta, si.basis.omega, si.basis.stiffnessFactor, si.basis.yieldLengthRatio]).toEqual([
      us.basis.beta,
      us.basis.omega,
      us.basis.stiffnessFactor,
      us.basis.yieldLengthRatio,
    ])
  })

  it('comes back to the same numbers after US → SI → US', () => {
    const us = usFrame()
    expect(convertWorksheetForm(convertWorksheetForm(us, 'si'), 'us')).toEqual(us)
  })

  it('keeps the physical frame: the same cores come out in both unit systems', () => {
    const us = sizeFrame(toSizingRequest(usFrame()))
    const si = sizeFrame(toSizingRequest(convertWorksheetForm(usFrame(), 'si')))
    si.levels.forEach((level, i) => {
      // mm² back to in² (÷ 645.16); the same core step is chosen.
      expect(level.coreArea / 645.16).toBeCloseTo(us.levels[i]!.coreArea, 6)
      expect(level.demandCapacityRatio).toBeCloseTo(us.levels[i]!.demandCapacityRatio, 8) // conversions move values by ≤ 1e-9 relative
    })
  })

  it.each([38, 46, 0.25, 28, 13.5, 1.3, 260, 1234.5, 0.001])('brings %d back exactly through SI for every quantity kind', value => {
    for (const kind of ['dimension', 'force', 'stress', 'area'] as const) {
      expect(convertValue(kind, convertValue(kind, value, 'us', 'si'), 'si', 'us')).toBe(value)
    }
  })

  it('keeps empty fields empty', () => {
    const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'us')
    const si = convertWorksheetForm(form, 'si')
    expect(si.bayWidth).toBeNull()
    expect(si.levels.every(l => l.storyHeight === null && l.storyShear === null)).toBe(true)
  })
})

describe('toSizingRequest(form)', () => {
  it('builds the request the engine sizes; hand check of story 1', () => {
    const r = sizeFrame(toSizingRequest(usFrame()))
    // derived: statics — cos θ = 14/√(14² + 15²) = 0.682318; Pu = 260/(4 × 0.682318) = 95.263 kip
    expect(r.levels[0]!.braceAxialDemand).toBeCloseTo(95.2635, 3)
    // AISC 341 F4.5b: Asc,req = Pu/(0.9 × 38) = 2.7855 in²
    expect(r.levels[0]!.requiredCoreArea).toBeCloseTo(2.7855, 4)
    expect(r.totals.braceCount).toBe(12)
  })

  it('sends empty fields as missing, so the engine names them', () => {
    const form = usFrame()
    form.levels[1]!.storyHeight = null
    expect(() => sizeFrame(toSizingRequest(form))).toThrow(/levels\.1\.storyHeight: .*got nothing/)
  })

  it('sends only the capacity basis that is chosen, and the core table only when it is on', () => {
    const form = usFrame()
    form.basis.basisKind = 'ry'
    form.basis.ry = 1.3
    form.basis.useCoreSteps = false
    const req = toSizingRequest(form)
    expect(req.capacityBasis).toEqual({ kind: 'ry', ry: 1.3 })
    expect(req.coreSteps).toBeUndefined()
  })
})

describe('basisFromDefaults / basisToDefaults', () => {
  it('round-trips the firm defaults through an SI form back to ksi and in²', () => {
    const si = basisFromDefaults(FALLBACK_SIZING_DEFAULTS, 'si')
    expect(si.fyscMin).toBeCloseTo(262.0008, 3) // 38 ksi
    const back = SizingDefaults.parse(basisToDefaults(si, 'si', 0.1))
    expect(back).toEqual(FALLBACK_SIZING_DEFAULTS)
  })

  it('lets the schema report an emptied field by its path', () => {
    const basis = basisFromDefaults(FALLBACK_SIZING_DEFAULTS, 'us')
    basis.beta = null
    const parsed = SizingDefaults.safeParse(basisToDefaults(basis, 'us', 0.1))
    expect(parsed.success).toBe(false)
    expect(parsed.error!.issues.map(i => i.path.join('.'))).toContain('beta')
  })
})

describe('maybeWorksheetForm(state) and isFrameEmpty(form)', () => {
  it('accepts a saved worksheet and refuses anything else', () => {
    const saved = JSON.parse(JSON.stringify(usFrame()))
    expect(maybeWorksheetForm(saved)).toEqual(saved)
    expect(maybeWorksheetForm({ ...saved, version: 2 })).toBeUndefined()
    expect(maybeWorksheetForm(null)).toBeUndefined()
    expect(maybeWorksheetForm({ ...saved, bayWidth: 'wide' })).toBeUndefined()
  })
  it('is empty until a bay width or a story value is entered', () => {
    const form = createWorksheetForm()
    expect(isFrameEmpty(form)).toBe(true)
    form.levels[0]!.storyShear = 10
    expect(isFrameEmpty(form)).toBe(false)
  })
})
