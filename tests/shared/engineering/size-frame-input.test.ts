import { describe, expect, it } from 'vitest'
import { EngineeringInputError, findSizeFrameIssues, sizeFrame, type SizeFrameRequest } from '@shared/engineering'

const valid: SizeFrameRequest = {
  units: 'us', method: 'lrfd', configuration: 'inverted_v', bayWidth: 30,
  levels: [{ name: 'L1', storyHeight: 14, storyShear: 250 }, { name: 'L2', storyHeight: 13, storyShear: 150 }],
  fyscMin: 38, capacityBasis: { kind: 'ry', ry: 1.3 }, beta: 1.1, omega: 1.3,
}

describe('sizeFrame(request) rejects invalid input with the field path', () => {
  // derived: each value cannot describe a real frame; the path is the API contract (docs/sizing-api.md)
  it.each([
    [{ units: 'imperial' }, 'units'],
    [{ method: 'wsd' }, 'method'],
    [{ configuration: 'k_brace' }, 'configuration'], // AISC 341 F4.4b (from memory): K-bracing not permitted
    [{ bayWidth: 0 }, 'bayWidth'],
    [{ bayWidth: Number.NaN }, 'bayWidth'],
    [{ bracedBays: 0 }, 'bracedBays'],
    [{ bracedBays: 2.5 }, 'bracedBays'],
    [{ bracedBays: 21 }, 'bracedBays'],
    [{ levels: [] }, 'levels'],
    [{ levels: Array.from({ length: 61 }, (_, i) => ({ name: `L${i}`, storyHeight: 13, storyShear: 10 })) }, 'levels'],
    [{ levels: [valid.levels[0], { name: 'L2', storyHeight: 13, storyShear: 0 }] }, 'levels.1.storyShear'],
    [{ levels: [valid.levels[0], valid.levels[1], { name: '', storyHeight: 13, storyShear: 10 }] }, 'levels.2.name'],
    [{ levels: [valid.levels[0], valid.levels[1], { name: 'L3', storyHeight: -13, storyShear: 10 }] }, 'levels.2.storyHeight'],
    [{ fyscMin: -38 }, 'fyscMin'],
    [{ capacityBasis: { kind: 'ry', ry: 0 } }, 'capacityBasis.ry'],
    [{ capacityBasis: { kind: 'yieldRange', fyscMax: 36 } }, 'capacityBasis.fyscMax'], // derived: max below min 38
    [{ capacityBasis: { kind: 'coupon', fysc: Number.POSITIVE_INFINITY } }, 'capacityBasis.fysc'],
    [{ capacityBasis: { kind: 'guess' } }, 'capacityBasis.kind'],
    [{ beta: 0 }, 'beta'],
    [{ omega: -1.3 }, 'omega'],
    [{ stiffnessFactor: 0 }, 'stiffnessFactor'],
    [{ yieldLengthRatio: 1.2 }, 'yieldLengthRatio'],
    [{ coreSteps: [{ upTo: 5, step: 0.25 }] }, 'coreSteps.0.upTo'], // table must end unbounded
    [{ coreSteps: [{ upTo: 5, step: 0.3 }, { upTo: null, step: 1 }] }, 'coreSteps.0.step'],
  ])('%o → %s', (override, field) => {
    const call = () => sizeFrame({ ...valid, ...override } as SizeFrameRequest)
    expect(call).toThrow(EngineeringInputError) // derived: invalid input (row comment)
    expect(call).toThrowError(expect.objectContaining({ field })) // contract: dotted field path, docs/sizing-api.md
  })

  it('lists every problem, first one as field, with an actionable message', () => {
    const issues = findSizeFrameIssues({ ...valid, bayWidth: -1, beta: 0 })
    expect(issues.map((i) => i.field)).toEqual(['bayWidth', 'beta']) // contract: all issues, request order
    expect(issues[0]!.message).toMatch(/enter the column-to-column bay width in ft/) // STYLE 4.8: actionable message naming the unit
    try {
      sizeFrame({ ...valid, bayWidth: -1, beta: 0 })
    } catch (error) {
      expect((error as EngineeringInputError).issues).toHaveLength(2) // contract: EngineeringInputError.issues
      expect((error as Error).message).toMatch(/^bayWidth: /) // contract: message starts with the field
    }
  })

  it('names SI units in SI messages', () => {
    const [issue] = findSizeFrameIssues({ ...valid, units: 'si', levels: [{ name: 'P1', storyHeight: 0, storyShear: 900 }] })
    expect(issue!.message).toMatch(/in m\.$/) // contract: SI requests name SI units
  })

  it('rejects a non-object request', () => {
    expect(() => sizeFrame(null as unknown as SizeFrameRequest)).toThrowError(expect.objectContaining({ field: '' })) // contract: empty path for the whole request
  })

  it('accepts the valid request', () => {
    expect(findSizeFrameIssues(valid)).toEqual([]) // derived: a valid request has no issues
  })
})
