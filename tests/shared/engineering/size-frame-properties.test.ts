import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { DEFAULT_CORE_STEPS, EngineeringInputError, roundUpCoreArea, sizeFrame, type SizeFrameRequest } from '@shared/engineering'
import { fromDisplay, ftToM, kipToKn, ksiToMpa, type QuantityKind } from '@shared/units'

// Property-based checks with fast-check. Each property is derived from the definitions
// (rounding up, monotonic sizing, unit invariance, field-named errors); the increment table
// itself is common practice, no source.

const configuration = fc.constantFrom('single_diagonal', 'inverted_v', 'v', 'two_story_x' as const)
const level = fc.record({
  name: fc.constantFrom('L1', 'L2', 'Roof'),
  storyHeight: fc.double({ min: 9, max: 30, noNaN: true }),
  storyShear: fc.double({ min: 5, max: 3000, noNaN: true }),
})
const basis = fc.oneof(
  fc.record({ kind: fc.constant('ry' as const), ry: fc.double({ min: 1, max: 1.6, noNaN: true }) }),
  fc.record({ kind: fc.constant('yieldRange' as const), fyscMax: fc.double({ min: 46, max: 60, noNaN: true }) }),
  fc.record({ kind: fc.constant('coupon' as const), fysc: fc.double({ min: 36, max: 60, noNaN: true }) }),
)
const usRequest: fc.Arbitrary<SizeFrameRequest> = fc.record({
  units: fc.constant('us' as const),
  method: fc.constantFrom('lrfd', 'asd' as const),
  configuration,
  bayWidth: fc.double({ min: 10, max: 45, noNaN: true }),
  bracedBays: fc.integer({ min: 1, max: 4 }),
  levels: fc.array(level, { minLength: 1, maxLength: 6 }),
  fyscMin: fc.double({ min: 36, max: 46, noNaN: true }),
  capacityBasis: basis,
  beta: fc.double({ min: 1, max: 1.3, noNaN: true }),
  omega: fc.double({ min: 1.1, max: 1.5, noNaN: true }),
  stiffnessFactor: fc.double({ min: 1.1, max: 1.8, noNaN: true }),
  yieldLengthRatio: fc.double({ min: 0.4, max: 0.8, noNaN: true }),
})

const bandStep = (sizeIn2: number) => {
  let previous = 0
  for (const { upToIn2, stepIn2 } of DEFAULT_CORE_STEPS) {
    if (upToIn2 === null || sizeIn2 <= upToIn2) return { previous, stepIn2 }
    previous = upToIn2
  }
  throw new Error('unreachable')
}

describe('roundUpCoreArea(requiredIn2) properties', () => {
  it('never returns less than the required area (beyond 1e-9) nor more than one step above it', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 200, noNaN: true }), (required) => {
        const size = roundUpCoreArea(required)
        const { previous, stepIn2 } = bandStep(size)
        expect(size).toBeGreaterThanOrEqual(required / (1 + 1e-9)) // never rounds down (engineering reference §6.2 [C])
        expect(size - required).toBeLessThanOrEqual(stepIn2 + 1e-12) // at most one step of the size's band
        const k = (size - previous) / stepIn2
        expect(Math.abs(k - Math.round(k))).toBeLessThan(1e-9) // on the grid of its band
      }),
    )
  })
})

describe('sizeFrame(request) properties', () => {
  it('more shear never gives a smaller core', () => {
    fc.assert(
      fc.property(usRequest, fc.double({ min: 1, max: 3, noNaN: true }), (request, factor) => {
        const more = { ...request, levels: request.levels.map((l) => ({ ...l, storyShear: l.storyShear * factor })) }
        const a = sizeFrame(request).levels
        const b = sizeFrame(more).levels
        a.forEach((level, i) => expect(b[i]!.coreArea).toBeGreaterThanOrEqual(level.coreArea)) // derived: monotonic sizing
      }),
    )
  })

  it('the provided core is never below the required area and the ratio never above 1', () => {
    fc.assert(
      fc.property(usRequest, (request) => {
        for (const l of sizeFrame(request).levels) {
          expect(l.coreArea).toBeGreaterThanOrEqual(l.requiredCoreArea / (1 + 1e-9)) // engineering reference §6.2 [C]
          expect(l.demandCapacityRatio).toBeLessThanOrEqual(1 + 1e-9) // derived: Asc ≥ Asc,req
          expect(l.adjustedCompression).toBeGreaterThanOrEqual(l.adjustedTension) // derived: β ≥ 1 in these inputs
        }
      }),
    )
  })

  it('US and SI inputs of the same physical frame give the same physical answer', () => {
    fc.assert(
      fc.property(usRequest, (us) => {
        const stress = (v: number) => ksiToMpa(v)
        const si: SizeFrameRequest = {
          ...us,
          units: 'si',
          bayWidth: ftToM(us.bayWidth),
          fyscMin: stress(us.fyscMin),
          levels: us.levels.map((l) => ({ ...l, storyHeight: ftToM(l.storyHeight), storyShear: kipToKn(l.storyShear) })),
          capacityBasis:
            us.capacityBasis.kind === 'ry' ? us.capacityBasis
              : us.capacityBasis.kind === 'yieldRange' ? { kind: 'yieldRange', fyscMax: stress(us.capacityBasis.fyscMax) }
                : { kind: 'coupon', fysc: stress(us.capacityBasis.fysc) },
        }
        const a = sizeFrame(us)
        const b = sizeFrame(si)
        a.levels.forEach((la, i) => {
          const lb = b.levels[i]!
          for (const [field, kind] of Object.entries(kinds)) {
            const va = la[field as keyof typeof la] as number | null
            const vb = lb[field as keyof typeof lb] as number | null
            if (va === null || vb === null) { expect(vb).toBe(va); continue } // derived: null (single diagonal) in both systems
            // Compare in canonical units: SI value converted back must equal the US value (NIST SP 811 factors)
            const usCanon = fromDisplay(kind, va, 'us')
            const siCanon = fromDisplay(kind, vb, 'si')
            expect(Math.abs(siCanon - usCanon)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(usCanon))) // NIST SP 811 App. B factors: same physical answer in both systems
          }
        })
        expect(fromDisplay('weight', b.totals.coreWeight, 'si')).toBeCloseTo(a.totals.coreWeight, 6) // NIST SP 811 App. B lb ↔ kg
      }),
    )
  })

  it('invalid input throws EngineeringInputError naming the field', () => {
    const corruption = fc.oneof(
      fc.tuple(fc.constant('bayWidth'), fc.constantFrom<unknown>(0, -12, Number.NaN, Number.POSITIVE_INFINITY, '30')),
      fc.tuple(fc.constant('fyscMin'), fc.constantFrom<unknown>(0, -36, Number.NaN, null)),
      fc.tuple(fc.constant('beta'), fc.constantFrom<unknown>(0, -1.1, Number.NEGATIVE_INFINITY)),
      fc.tuple(fc.constant('omega'), fc.constantFrom<unknown>(0, -1.3, Number.NaN)),
      fc.tuple(fc.constant('stiffnessFactor'), fc.constantFrom<unknown>(0, -1.4)),
      fc.tuple(fc.constant('yieldLengthRatio'), fc.constantFrom<unknown>(0, 1.5, -0.6)),
      fc.tuple(fc.constant('bracedBays'), fc.constantFrom<unknown>(0, 21, 1.5)),
    )
    fc.assert(
      fc.property(usRequest, corruption, fc.nat(), (request, [field, bad], levelPick) => {
        expectFieldError(() => sizeFrame({ ...request, [field]: bad } as SizeFrameRequest), field)
        // and one story field at a chosen level
        const i = levelPick % request.levels.length
        const levels = request.levels.map((l, j) => (j === i ? { ...l, storyHeight: -Math.abs(l.storyHeight) } : l))
        expectFieldError(() => sizeFrame({ ...request, levels }), `levels.${i}.storyHeight`)
      }),
    )
  })
})

const kinds: Record<string, QuantityKind> = {
  angleDeg: 'angle', braceLength: 'dimension', braceAxialDemand: 'force', requiredCoreArea: 'area', coreArea: 'area',
  demandCapacityRatio: 'ratio', yieldStrength: 'force', adjustedTension: 'force', adjustedCompression: 'force',
  beamUnbalancedLoad: 'force', beamHorizontalForce: 'force', columnAxial: 'force', columnAxialTension: 'force',
  connectionRequiredStrength: 'force', stiffness: 'stiffness', yieldDeformation: 'length', driftAtYield: 'length',
  coreWeight: 'weight',
}

function expectFieldError(call: () => unknown, field: string) {
  try {
    call()
  } catch (error) {
    expect(error).toBeInstanceOf(EngineeringInputError) // contract: EngineeringInputError
    expect(error).toBeInstanceOf(RangeError) // STYLE 4.8: invalid input throws a RangeError
    expect((error as EngineeringInputError).field).toBe(field) // contract: field path, docs/sizing-api.md
    return
  }
  throw new Error(`expected sizeFrame to throw for ${field}`)
}
