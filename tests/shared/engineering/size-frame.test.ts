import { describe, expect, it } from 'vitest'
import { SIZE_FRAME_CAUTIONS, sizeFrame, type SizeFrameRequest } from '@shared/engineering'

// Hand-worked examples on invented frames. 3-4-5 triangles keep sin θ and cos θ exact.
// Sources for each step: geometry and demand — statics (engineering reference §6); φ 0.90 / Ω 1.67 —
// AISC 341 F4.5b (from memory); Tmax, Cmax — AISC 341 F4.2a (from memory); connection 1.1 Cmax —
// AISC 341-16 F4.6c (from memory); columns — common practice, follows AISC 341 F4.3 method;
// core increments — common practice, no source; E 29,000 ksi and 490 lb/ft³ — AISC, from memory.

describe('sizeFrame(request) — single diagonal, LRFD, Ry basis (invented frame A)', () => {
  // Bay 24 ft = 288 in, stories 18 ft = 216 in → Lwp 360 in, θ 36.870° (cos 0.8, sin 0.6), n = 1.
  const request: SizeFrameRequest = {
    units: 'us', method: 'lrfd', configuration: 'single_diagonal', bayWidth: 24,
    levels: [{ name: 'L1', storyHeight: 18, storyShear: 144 }, { name: 'L2', storyHeight: 18, storyShear: 96 }],
    fyscMin: 40, capacityBasis: { kind: 'ry', ry: 1.2 }, beta: 1.1, omega: 1.25,
  }
  const r = sizeFrame(request)
  const [l1, l2] = r.levels

  it('sizes each story', () => {
    expect(l1!.angleDeg).toBeCloseTo(36.8699, 4) // statics: atan(216/288)
    expect(l1!.braceLength).toBeCloseTo(30, 9) // statics: 360 in = 30 ft
    expect(l1!.bracesAtLevel).toBe(1) // engineering reference §6.1
    expect(l1!.braceAxialDemand).toBeCloseTo(180, 9) // statics: 144 / (1 × 0.8)
    expect(l1!.requiredCoreArea).toBeCloseTo(5, 9) // AISC 341 F4.5b (from memory): 180 / (0.9 × 40) = 5.0
    expect(l1!.coreArea).toBe(5) // common practice, no source: exactly on the 5 in² boundary, stays
    expect(l1!.demandCapacityRatio).toBeCloseTo(1, 9) // AISC 341 F4.5b (from memory): 180 / (36 × 5)
    expect(l2!.braceAxialDemand).toBeCloseTo(120, 9) // statics: 96 / 0.8
    expect(l2!.requiredCoreArea).toBeCloseTo(3.333333, 6) // AISC 341 F4.5b (from memory): 120 / 36
    expect(l2!.coreArea).toBe(3.5) // common practice, no source: 3.333 → 3.5
    expect(l2!.demandCapacityRatio).toBeCloseTo(0.952381, 6) // 120 / (36 × 3.5) = 120 / 126
  })

  it('gives the adjusted strengths on the provided core', () => {
    // AISC 341 F4.2a (from memory): L1 Pysc = 40 × 5 = 200; Tmax = 1.25 × 1.2 × 40 × 5 = 300; Cmax = 1.1 × 300 = 330
    expect(l1!.yieldStrength).toBeCloseTo(200, 9)
    expect(l1!.expectedYieldStrength).toBeCloseTo(240, 9) // 1.2 × 40 × 5
    expect(l1!.adjustedTension).toBeCloseTo(300, 9) // AISC 341 F4.2a (from memory): 1.25 × 1.2 × 200
    expect(l1!.adjustedCompression).toBeCloseTo(330, 9) // AISC 341 F4.2a (from memory): 1.1 × 300
    // L2: Pysc = 140; Tmax = 1.25 × 48 × 3.5 = 210; Cmax = 231
    expect(l2!.adjustedTension).toBeCloseTo(210, 9)
    expect(l2!.adjustedCompression).toBeCloseTo(231, 9) // AISC 341 F4.2a (from memory): 1.1 × 210
    expect(l1!.connectionRequiredStrength).toBeCloseTo(363, 9) // AISC 341-16 F4.6c (from memory): 1.1 × 330
    expect(l2!.connectionRequiredStrength).toBeCloseTo(254.1, 9) // 1.1 × 231
  })

  it('gives beam and column forces', () => {
    expect(l1!.beamUnbalancedLoad).toBeNull() // statics: no midspan intersection
    expect(l1!.beamUnbalancedDirection).toBeNull() // statics: single diagonal
    expect(l1!.beamHorizontalForce).toBeCloseTo(264, 9) // statics: Cmax cos θ = 330 × 0.8
    // common practice, follows AISC 341 F4.3 method: L2 C 231 × 0.6 = 138.6, T 210 × 0.6 = 126
    expect(l2!.columnAxial).toBeCloseTo(138.6, 9)
    expect(l2!.columnAxialTension).toBeCloseTo(126, 9) // F4.3 method: 210 × 0.6
    // L1 C 138.6 + 330 × 0.6 = 336.6, T 126 + 300 × 0.6 = 306
    expect(l1!.columnAxial).toBeCloseTo(336.6, 9)
    expect(l1!.columnAxialTension).toBeCloseTo(306, 9) // F4.3 method: 126 + 300 × 0.6
  })

  it('gives stiffness, yield deformation and weights with the defaults KF 1.4, Ly/Lwp 0.6', () => {
    expect(r.assumptions.stiffnessFactor).toBe(1.4) // common practice default (engineering reference §5, from memory)
    expect(l1!.stiffness).toBeCloseTo(563.8889, 4) // engineering reference §5 [D]: 1.4 × 29000 × 5 / 360
    expect(l1!.yieldDeformation).toBeCloseTo(0.35468, 5) // Δby = 200 / 563.889
    expect(l1!.driftAtYield).toBeCloseTo(0.44335, 5) // 0.35468 / 0.8
    expect(l1!.driftRatioAtYield).toBeCloseTo(0.44335 / 216, 7) // derived: 0.44335 in / 216 in
    expect(l1!.coreWeight).toBeCloseTo(306.25, 9) // AISC 490 lb/ft³ (from memory): 490 × 5 × (0.6 × 360) / 1728
    expect(l2!.coreWeight).toBeCloseTo(214.375, 9) // 490 × 3.5 × 216 / 1728
    expect(r.totals.coreWeight).toBeCloseTo(520.625, 9) // 306.25 + 214.375
    expect(r.totals.braceCount).toBe(2) // derived: 1 brace × 2 stories
    // common practice, no source: 2.5 × 490 × (5 + 3.5) × 360 / 1728 = 2169.27 lb
    expect(r.totals.estimatedBraceWeight).toBeCloseTo(2169.2708, 3)
    expect(r.totals.maxDemandCapacityRatio).toBeCloseTo(1, 9) // derived: max(1.0, 0.952)
  })

  it('names units, returns no warnings, and always carries the cautions', () => {
    expect(r.units.coreArea).toBe('in²') // contract: DISPLAY_UNITS.us
    expect(r.units.braceLength).toBe('ft') // contract: DISPLAY_UNITS.us
    expect(r.units.stiffness).toBe('kip/in') // contract: DISPLAY_UNITS.us
    expect(r.units.yieldDeformation).toBe('in') // contract: DISPLAY_UNITS.us
    expect(r.warnings).toEqual([]) // derived: all factors inside FACTOR_RANGES
    expect(r.sharedBeams).toEqual([]) // derived: not a two-story X
    expect(r.cautions).toEqual([...SIZE_FRAME_CAUTIONS]) // practice reference §e: customary cautions
    expect(r.cautions.join(' ')).toMatch(/preliminary design aid/) // practice reference §e caution 1
    expect(r.cautions.join(' ')).toMatch(/supplier/) // practice reference §e caution 2
    expect(r.cautions.join(' ')).toMatch(/engineer of record decides/) // practice reference §e caution 3
  })

  it('sizes the same frame in ASD', () => {
    const asd = sizeFrame({ ...request, method: 'asd' })
    // AISC 341 F4.5b (from memory): Pa = 180; 1.67 × 180 / 40 = 7.515 → 8.0 in² (0.5 band; common practice)
    expect(asd.levels[0]!.requiredCoreArea).toBeCloseTo(7.515, 9)
    expect(asd.levels[0]!.coreArea).toBe(8) // common practice, no source: 7.515 → 8.0
    expect(asd.levels[0]!.demandCapacityRatio).toBeCloseTo(0.939375, 6) // 300.6 / (40 × 8)
    expect(asd.assumptions.safetyFactor).toBe(1.67) // AISC 341 F4.5b (from memory): Ω = 1.67
    expect(asd.assumptions.resistanceFactor).toBeNull() // derived: ASD uses Ω, not φ
  })

  it('never applies Ry to a coupon value', () => {
    const coupon = sizeFrame({ ...request, capacityBasis: { kind: 'coupon', fysc: 45 } })
    // AISC 341 F4.2a Ry exception (from memory): Tmax = 1.25 × 45 × 5 = 281.25 (not × 1.2 = 337.5)
    expect(coupon.levels[0]!.coreArea).toBe(5) // sizing still uses Fysc,min = 40
    expect(coupon.levels[0]!.adjustedTension).toBeCloseTo(281.25, 9) // AISC 341 F4.2a Ry exception (from memory)
    expect(coupon.levels[0]!.adjustedCompression).toBeCloseTo(309.375, 9) // 1.1 × 281.25
    expect(coupon.assumptions.ryApplied).toBe(1) // AISC 341 F4.2a Ry exception (from memory)
  })
})

describe('sizeFrame(request) — inverted-V, ASD, yield range, 2 braced bays (invented frame B)', () => {
  // Bay 30 ft: projection 15 ft = 180 in, story 20 ft = 240 in → Lwp 300 in, θ 53.130° (cos 0.6, sin 0.8); n = 2 × 2 = 4.
  const r = sizeFrame({
    units: 'us', method: 'asd', configuration: 'inverted_v', bayWidth: 30, bracedBays: 2,
    levels: [{ name: 'Ground', storyHeight: 20, storyShear: 240 }],
    fyscMin: 38, capacityBasis: { kind: 'yieldRange', fyscMax: 46 }, beta: 1.15, omega: 1.3,
  })
  const l = r.levels[0]!
  it('works the story by hand', () => {
    expect(l.bracesAtLevel).toBe(4) // engineering reference §6.1: 2 per bay × 2 bays
    expect(l.braceAxialDemand).toBeCloseTo(100, 9) // statics: 240 / (4 × 0.6)
    expect(l.requiredCoreArea).toBeCloseTo(4.394737, 6) // AISC 341 F4.5b (from memory): 1.67 × 100 / 38
    expect(l.coreArea).toBe(4.5) // common practice, no source
    expect(l.demandCapacityRatio).toBeCloseTo(0.976608, 6) // 167 / (38 × 4.5) = 167 / 171
    expect(l.yieldStrength).toBeCloseTo(171, 9) // 38 × 4.5
    // engineering reference §1.6 (common practice): Fysc,max replaces Ry Fysc, Ry = 1.0
    expect(l.adjustedTension).toBeCloseTo(269.1, 9) // AISC 341 F4.2a (from memory): 1.3 × 46 × 4.5
    expect(l.adjustedCompression).toBeCloseTo(309.465, 9) // 1.15 × 269.1
    expect(l.beamUnbalancedLoad).toBeCloseTo(32.292, 9) // AISC 341 F4.4a (from memory): (309.465 − 269.1) × 0.8
    expect(l.beamUnbalancedDirection).toBe('up') // statics: beam above an inverted-V
    expect(l.beamHorizontalForce).toBeCloseTo(347.139, 9) // statics: (309.465 + 269.1) × 0.6
    expect(l.columnAxial).toBeCloseTo(247.572, 9) // F4.3 method: 309.465 × 0.8
    expect(l.columnAxialTension).toBeCloseTo(215.28, 9) // F4.3 method: 269.1 × 0.8
    expect(l.connectionRequiredStrength).toBeCloseTo(340.4115, 9) // AISC 341-16 F4.6c (from memory): 1.1 × 309.465
    expect(l.stiffness).toBeCloseTo(609, 9) // 1.4 × 29000 × 4.5 / 300 = 182700 / 300
    expect(l.yieldDeformation).toBeCloseTo(0.280788, 6) // 171 / 609
    expect(l.driftAtYield).toBeCloseTo(0.467980, 6) // 0.280788 / 0.6
    expect(l.coreWeight).toBeCloseTo(918.75, 9) // 4 × 490 × 4.5 × 180 / 1728 = 4 × 229.6875
    expect(r.assumptions.expectedYieldStress).toBe(46) // engineering reference §1.6 (common practice): Fysc,max
    expect(r.warnings).toEqual([]) // derived: all factors inside FACTOR_RANGES
  })
})

describe('sizeFrame(request) — V, LRFD, coupon, SI units with a firm mm² table (invented frame C)', () => {
  // Bay 8 m: projection 4 m, story 4 m → θ 45°, Lwp 4√2 = 5.656854 m; n = 2.
  const r = sizeFrame({
    units: 'si', method: 'lrfd', configuration: 'v', bayWidth: 8,
    levels: [{ name: 'P1', storyHeight: 4, storyShear: 1000 }],
    fyscMin: 262, capacityBasis: { kind: 'coupon', fysc: 290 }, beta: 1.2, omega: 1.4,
    coreSteps: [{ upTo: 5000, step: 100 }, { upTo: null, step: 250 }],
  })
  const l = r.levels[0]!
  it('works the story by hand in SI', () => {
    expect(r.units.coreArea).toBe('mm²') // contract: DISPLAY_UNITS.si
    expect(r.units.braceAxialDemand).toBe('kN') // contract: DISPLAY_UNITS.si
    expect(l.angleDeg).toBeCloseTo(45, 9) // statics
    expect(l.braceLength).toBeCloseTo(5.656854, 6) // statics: √(4² + 4²) m
    expect(l.braceAxialDemand).toBeCloseTo(707.1068, 4) // statics: 1000 / (2 × 0.707107)
    // AISC 341 F4.5b (from memory): 707 106.8 N / (0.9 × 262 N/mm²) = 707106.8 / 235.8 = 2998.756 mm²
    expect(l.requiredCoreArea).toBeCloseTo(2998.756, 2)
    expect(l.coreArea).toBeCloseTo(3000, 6) // invented firm table, no source: 100 mm² steps
    expect(l.demandCapacityRatio).toBeCloseTo(0.9995855, 6) // 707.1068 / (0.9 × 262 × 3000 / 1000) = 707.1068 / 707.4
    expect(l.yieldStrength).toBeCloseTo(786, 6) // 262 × 3000 / 1000 kN
    // AISC 341 F4.2a Ry exception (from memory): Tmax = 1.4 × 290 × 3000 / 1000 = 1218 kN; Cmax = 1.2 × 1218 = 1461.6 kN
    expect(l.adjustedTension).toBeCloseTo(1218, 6)
    expect(l.adjustedCompression).toBeCloseTo(1461.6, 6) // AISC 341 F4.2a (from memory): 1.2 × 1218
    expect(l.beamUnbalancedLoad).toBeCloseTo(172.2512, 4) // AISC 341 F4.4a (from memory): 243.6 × 0.7071068
    expect(l.beamUnbalancedDirection).toBe('down') // statics: beam below a V
    expect(l.beamHorizontalForce).toBeCloseTo(1894.7633, 4) // statics: 2679.6 × 0.7071068
    expect(l.connectionRequiredStrength).toBeCloseTo(1607.76, 6) // AISC 341-16 F4.6c (from memory): 1.1 × 1461.6
    // K = 1.4 × E × A / L with E = 29000 ksi = 199 947.96 MPa: 1.4 × 199947.96 × 3000 / 5656.854 = 148 453.8 N/mm
    expect(l.stiffness).toBeCloseTo(148.4538, 3)
    expect(l.yieldDeformation).toBeCloseTo(5.2946, 4) // Δby = 786 000 N / 148 453.8 N/mm = 5.2946 mm
    // 490 lb/ft³ = 7849.047 kg/m³ (from memory, AISC): 2 × 7849.047 × 0.003 m² × (0.6 × 5.656854 m) = 159.843 kg
    expect(l.coreWeight).toBeCloseTo(159.843, 3)
    expect(r.assumptions.coreSteps).toEqual([{ upTo: 5000, step: 100 }, { upTo: null, step: 250 }]) // contract: echoed in the request unit (mm²)
    expect(r.warnings).toEqual([]) // derived: all factors inside FACTOR_RANGES
  })
})

describe('sizeFrame(request) — two-story X, LRFD, Ry basis (invented frame D)', () => {
  // Bay 24 ft: projection 12 ft = 144 in, stories 16 ft = 192 in → Lwp 240 in, θ 53.130° (cos 0.6, sin 0.8); n = 2.
  const r = sizeFrame({
    units: 'us', method: 'lrfd', configuration: 'two_story_x', bayWidth: 24,
    levels: [{ name: '2', storyHeight: 16, storyShear: 216 }, { name: '3', storyHeight: 16, storyShear: 120 }],
    fyscMin: 38, capacityBasis: { kind: 'ry', ry: 1.3 }, beta: 1.1, omega: 1.3,
  })
  const [l1, l2] = r.levels
  it('sizes both stories', () => {
    expect(l1!.braceAxialDemand).toBeCloseTo(180, 9) // statics: 216 / (2 × 0.6)
    expect(l1!.requiredCoreArea).toBeCloseTo(5.263158, 6) // AISC 341 F4.5b (from memory): 180 / 34.2
    expect(l1!.coreArea).toBe(5.5) // common practice, no source: just above 5 → 0.5 band
    expect(l2!.requiredCoreArea).toBeCloseTo(2.923977, 6) // 100 / 34.2
    expect(l2!.coreArea).toBe(3) // common practice, no source
    // AISC 341 F4.2a (from memory), Ry 1.3 (Table A3.1 A36 plate, from memory): 1.3 × 1.3 × 38 × 5.5 = 353.21; × 1.1 = 388.531
    expect(l1!.adjustedTension).toBeCloseTo(353.21, 9)
    expect(l1!.adjustedCompression).toBeCloseTo(388.531, 9) // AISC 341 F4.2a (from memory): 1.1 × 353.21
    expect(l2!.adjustedTension).toBeCloseTo(192.66, 9) // 1.3 × 49.4 × 3
    expect(l2!.adjustedCompression).toBeCloseTo(211.926, 9) // AISC 341 F4.2a (from memory): 1.1 × 192.66
  })
  it('reports the chevron below and the V above the shared beam, and the shared-beam cases', () => {
    expect(l1!.beamUnbalancedDirection).toBe('up') // engineering reference §6.3 [C]: lower-story chevron pushes up
    expect(l1!.beamUnbalancedLoad).toBeCloseTo(28.2568, 9) // (388.531 − 353.21) × 0.8
    expect(l2!.beamUnbalancedDirection).toBe('down') // upper-story V pushes down
    expect(l2!.beamUnbalancedLoad).toBeCloseTo(15.4128, 9) // (211.926 − 192.66) × 0.8
    expect(r.sharedBeams).toHaveLength(1) // common practice (§6.3 [C]): one pair of stories
    const shared = r.sharedBeams[0]!
    expect(shared.lowerLevel).toBe('2') // contract: pair names
    expect(shared.upperLevel).toBe('3') // contract: pair names
    expect(shared.combinedLoad).toBeCloseTo(12.844, 9) // common practice: 28.2568 − 15.4128
    expect(shared.combinedDirection).toBe('up') // derived: 28.2568 > 15.4128
    expect(shared.governingLoad).toBeCloseTo(28.2568, 9) // the chevron alone governs
  })
  it('accumulates column forces from the top', () => {
    // common practice, follows AISC 341 F4.3 method: 211.926 × 0.8 = 169.5408; + 388.531 × 0.8 = 480.3656
    expect(l2!.columnAxial).toBeCloseTo(169.5408, 9)
    expect(l1!.columnAxial).toBeCloseTo(480.3656, 9) // F4.3 method: 169.5408 + 388.531 × 0.8
    expect(l1!.columnAxialTension).toBeCloseTo(436.696, 9) // 192.66 × 0.8 + 353.21 × 0.8
  })
})

describe('sizeFrame(request) warnings', () => {
  const base: SizeFrameRequest = {
    units: 'us', method: 'lrfd', configuration: 'single_diagonal', bayWidth: 24,
    levels: [{ name: 'L1', storyHeight: 18, storyShear: 144 }],
    fyscMin: 40, capacityBasis: { kind: 'ry', ry: 1.2 }, beta: 1.1, omega: 1.25,
  }
  it.each([
    [{ beta: 1.35 }, 'beta'], // AISC 341 K3.8 (from memory): β ≤ 1.3
    [{ beta: 0.97 }, 'beta'], // AISC 341 F4.2b (from memory): β ≥ 1.0
    [{ omega: 1.7 }, 'omega'], // engineering reference §5, from memory
    [{ stiffnessFactor: 2.3 }, 'stiffnessFactor'], // engineering reference §5, from memory
    [{ yieldLengthRatio: 0.9 }, 'yieldLengthRatio'], // engineering reference §5, from memory
    [{ capacityBasis: { kind: 'coupon', fysc: 36 } }, 'capacityBasis.fysc'], // derived: coupon below the specified minimum
    [{ fyscMin: 262 }, 'fyscMin'], // common practice, no source: 262 "ksi" is an MPa value in a US request
    [{ bayWidth: 60 }, 'levels.0.storyHeight'], // common practice, no source: θ = atan(18/60) = 16.7° < 30°
  ] as const)('warns (does not throw) for %o', (override, field) => {
    const r = sizeFrame({ ...base, ...override } as SizeFrameRequest)
    expect(r.warnings.map((w) => w.field)).toContain(field) // returned warning, not thrown (STYLE 4.8); source in the row comment
  })
  it('warns that an odd two-story X tops out as an inverted-V', () => {
    const r = sizeFrame({ ...base, configuration: 'two_story_x', levels: [...base.levels, ...base.levels, ...base.levels] })
    expect(r.warnings.map((w) => w.field)).toContain('levels') // engineering reference §6.1 [C]
    expect(r.sharedBeams).toHaveLength(1) // derived: stories (0, 1) pair; story 2 stands alone
    expect(r.levels[2]!.beamUnbalancedDirection).toBe('up') // engineering reference §6.1 [C]: top story acts as an inverted-V
  })
})
