import { describe, expect, expectTypeOf, it } from 'vitest'
import { ZodError } from 'zod'
import { SizingRequest, SizingResponse, toSizingErrorFields } from '@shared/schemas/sizing'
import { sizeFrame, type SizeFrameRequest, type SizeFrameResult } from '@shared/engineering'

const body = {
  units: 'us', method: 'lrfd', configuration: 'v', bayWidth: 28,
  levels: [{ name: ' L1 ', storyHeight: 14, storyShear: 220 }],
  fyscMin: 38, capacityBasis: { kind: 'ry', ry: 1.3 }, beta: 1.1, omega: 1.3,
}

describe('SizingRequest', () => {
  it('applies the documented defaults', () => {
    const parsed = SizingRequest.parse(body)
    expect(parsed.bracedBays).toBe(1) // docs/sizing-api.md default
    expect(parsed.stiffnessFactor).toBe(1.4) // common practice default (engineering reference §5, from memory)
    expect(parsed.yieldLengthRatio).toBe(0.6) // common practice default (engineering reference §5, from memory)
    expect(parsed.levels[0]!.name).toBe('L1') // trimmed
    expect(parsed.coreSteps).toBeUndefined() // contract: optional, default table applied by sizeFrame
  })

  it('parses to a value sizeFrame accepts, and sizeFrame answers a valid SizingResponse', () => {
    expectTypeOf<SizingRequest>().toExtend<SizeFrameRequest>()
    expectTypeOf<SizeFrameResult>().toExtend<SizingResponse>()
    const result = sizeFrame(SizingRequest.parse(body))
    expect(() => SizingResponse.parse(result)).not.toThrow() // contract: docs/sizing-api.md
    expect(JSON.parse(JSON.stringify(result))).toEqual(result) // derived: plain JSON, no NaN/Infinity/undefined
  })

  it.each([
    [{ bayWidth: Number.POSITIVE_INFINITY }, 'bayWidth'], // positive finite numbers only
    [{ bayWidth: -28 }, 'bayWidth'],
    [{ levels: [] }, 'levels'], // min 1 level
    [{ levels: Array.from({ length: 61 }, () => body.levels[0]) }, 'levels'], // max 60 levels
    [{ bracedBays: 21 }, 'bracedBays'], // max 20 braced bays
    [{ bracedBays: 1.5 }, 'bracedBays'],
    [{ capacityBasis: { kind: 'coupon' } }, 'capacityBasis.fysc'],
    [{ capacityBasis: { kind: 'yieldRange', fyscMax: 30 } }, 'capacityBasis.fyscMax'], // derived: below fyscMin 38
    [{ yieldLengthRatio: 1.1 }, 'yieldLengthRatio'],
    [{ coreSteps: [{ upTo: 5, step: 0.25 }, { upTo: 4, step: 0.5 }, { upTo: null, step: 1 }] }, 'coreSteps.1.upTo'],
    [{ levels: [{ name: 'L1', storyHeight: 14, storyShear: 0 }] }, 'levels.0.storyShear'],
  ])('rejects %o at %s', (override, field) => {
    const result = SizingRequest.safeParse({ ...body, ...override })
    expect(result.success).toBe(false) // contract: SizingRequest rules (row comment)
    expect(Object.keys(toSizingErrorFields(result.error) ?? {})).toContain(field) // contract: fields map, docs/sizing-api.md
  })
})

describe('toSizingErrorFields(error)', () => {
  it('maps an EngineeringInputError from sizeFrame to { field: message }', () => {
    try {
      sizeFrame({ ...(body as SizeFrameRequest), levels: [{ name: 'L1', storyHeight: -1, storyShear: 10 }] })
    } catch (error) {
      expect(toSizingErrorFields(error)).toEqual({ 'levels.0.storyHeight': expect.stringMatching(/greater than 0/) }) // contract: fields map, docs/sizing-api.md
      return
    }
    throw new Error('expected a throw')
  })
  it('names a whole-body problem (body)', () => {
    try {
      sizeFrame(null as unknown as SizeFrameRequest)
    } catch (error) {
      expect(toSizingErrorFields(error)).toEqual({ '(body)': expect.any(String) }) // contract: same key as toFieldMessages in api-error.ts
      return
    }
    throw new Error('expected a throw')
  })
  it('returns null for other errors', () => {
    expect(toSizingErrorFields(new Error('boom'))).toBeNull() // contract: only validation errors map to fields
    expect(toSizingErrorFields(new ZodError([]))).toEqual({}) // derived: no issues, empty map
  })
})
