import { describe, expect, it } from 'vitest'
import { transform } from '../../etl/src/transform'
import { bundle, validProject } from './bundle-builder'

const clone = <T>(v: T): T => structuredClone(v)

describe('transform(bundles)', () => {
  it('turns a valid project into one record in stored units', () => {
    const { projects, problems, rejected } = transform([bundle(validProject())])
    expect(rejected.size).toBe(0)
    expect(problems.filter(p => p.severity === 'error')).toEqual([])
    const [p] = projects
    expect(p!.fields).toMatchObject({ code: 'T-001', stories: 2, yearDesigned: 2019, clientConfidential: true })
    const frame = p!.frames[0]!
    expect(frame.bayWidthIn).toBe(360) // 30 ft × 12 in/ft (exact)
    expect(frame.levels.map(l => l.name)).toEqual(['L2', 'Roof'])
    const coupon = frame.levels[0]!.brace!.snapshots.find(s => s.phase === 'coupon')!
    // AISC 341-16 F4.2a: coupon yield, no Ry — Tmax = ω·Fysc·Asc = 1.45 · 42.5 · 6.5 = 400.5625 kip
    expect(coupon.adjustedTensionKip).toBeCloseTo(400.5625, 9)
    // Cmax = β·Tmax = 1.12 · 400.5625 = 448.63 kip
    expect(coupon.adjustedCompressionKip).toBeCloseTo(448.63, 9)
    const sd = frame.levels[0]!.brace!.snapshots.find(s => s.phase === 'sd')!
    // yield-range basis uses the upper bound: 1.4 · 46 · 6.5 = 418.6 kip
    expect(sd.adjustedTensionKip).toBeCloseTo(418.6, 9)
    expect(p!.reviews).toEqual([])
  })

  it('converts a per-column SI unit with the NIST SP 811 factor (1 kip = 4.448222 kN)', () => {
    const t = clone(validProject())
    t.levels = t.levels.map(({ story_shear, ...rest }) => ({ ...rest, 'story_shear [kN]': (story_shear as number) * 4.4482216152605 }))
    const { projects } = transform([bundle(t)])
    // NIST SP 811 App. B: 1 lbf = 4.4482216152605 N
    expect(projects[0]!.frames[0]!.levels[0]!.storyShearKip).toBeCloseTo(300, 9)
  })

  it('rejects every project of a table whose quantity column has no unit', () => {
    const { rejected, problems } = transform([bundle(validProject(), {})])
    expect([...rejected]).toEqual(['T-001'])
    const p = problems.find(x => x.column === 'bay_width')!
    expect(p.message).toMatch(/No unit for "bay_width"/)
    expect(p).toMatchObject({ file: 'test.xlsx', sheet: 'frames', row: 2 })
  })

  it('rejects an unknown unit token, naming it and the accepted ones', () => {
    const t = clone(validProject())
    t.levels = t.levels.map(({ story_height, ...rest }) => ({ ...rest, 'story_height [yd]': story_height }))
    const { rejected, problems } = transform([bundle(t)])
    expect(rejected.has('T-001')).toBe(true)
    expect(problems.some(p => /Unknown unit "yd" for story_height; expected one of ft, in, m, mm/.test(p.message))).toBe(true)
  })

  it.each([
    ['a missing required value', (t: ReturnType<typeof validProject>) => (t.levels[1]!.story_height = null), /story_height is required/],
    ['an unreadable number', (t: ReturnType<typeof validProject>) => (t.levels[1]!.story_shear = '12O'), /story_shear must be a number/],
    ['a negative height', (t: ReturnType<typeof validProject>) => (t.levels[1]!.story_height = -13), /cannot be right/],
    ['Infinity', (t: ReturnType<typeof validProject>) => (t.levels[0]!.story_shear = 'Infinity'), /must be a number/],
    ['an unknown configuration', (t: ReturnType<typeof validProject>) => (t.frames[0]!.configuration = 'k_brace'), /configuration must be one of/],
    ['a level of a frame that does not exist', (t: ReturnType<typeof validProject>) => (t.levels[1]!.frame_line = 'Z'), /frame line Z, which project T-001 does not have/],
    ['brace values for a level without braces', (t: ReturnType<typeof validProject>) => (t.brace_values[2]!.level = 'L9'), /level L9 of frame A, which has no braces row/],
    ['two governing snapshots', (t: ReturnType<typeof validProject>) => (t.brace_values[0]!.governing = 'yes'), /2 governing snapshots/],
  ])('rejects the project for %s, saying where', (_label, mutate, message) => {
    const t = clone(validProject())
    mutate(t)
    const { projects, rejected, problems } = transform([bundle(t)])
    expect(projects).toEqual([])
    expect(rejected.has('T-001')).toBe(true)
    const p = problems.find(x => message.test(x.message))
    expect(p, problems.map(x => x.message).join('\n')).toBeDefined()
    expect(p!.file).toBe('test.xlsx')
    expect(p!.row).toBeGreaterThan(1)
  })

  it('loads the good project and rejects only the bad one of a file', () => {
    const good = validProject('T-GOOD')
    const bad = validProject('T-BAD')
    bad.levels[0]!.story_height = 'fifteen'
    const merged = Object.fromEntries(Object.keys(good).map(k => [k, [...good[k as keyof typeof good], ...(k === 'suppliers' ? [] : bad[k as keyof typeof bad])]]))
    const { projects, rejected } = transform([bundle(merged)])
    expect(projects.map(p => p.fields.code)).toEqual(['T-GOOD'])
    expect([...rejected]).toEqual(['T-BAD'])
  })

  it('rejects a project that appears twice in projects', () => {
    const t = clone(validProject())
    t.projects.push({ ...t.projects[0]! })
    const { rejected, problems } = transform([bundle(t)])
    expect(rejected.has('T-001')).toBe(true)
    expect(problems.some(p => /appears 2 times in projects \(rows 2, 3\)/.test(p.message))).toBe(true)
  })

  describe('review queue (never auto-fixed, never loaded silently)', () => {
    const reviewsFor = (mutate: (t: ReturnType<typeof validProject>) => void) => {
      const t = clone(validProject())
      mutate(t)
      const { projects, rejected } = transform([bundle(t)])
      expect(rejected.size).toBe(0)
      return projects[0]!
    }

    it('flags 3.8 ksi as a likely decimal slip and keeps the value as written', () => {
      const p = reviewsFor(t => (t.brace_values[1]!.fysc = 3.8))
      expect(p.reviews.map(r => r.reason).join()).toMatch(/fysc 3.8 ksi .* likely a decimal slip/)
      const coupon = p.frames[0]!.levels[0]!.brace!.snapshots.find(s => s.phase === 'coupon')!
      expect(coupon.fyscKsi).toBe(3.8)
      expect(coupon.confirmed).toBe(false)
    })

    it('flags 290 in a ksi column as MPa typed in a ksi column', () => {
      // 290 MPa / 6.894757 = 42.06 ksi, inside the plausible 30–65 ksi band (NIST SP 811 factor)
      const p = reviewsFor(t => (t.brace_values[1]!.fysc = 290))
      expect(p.reviews[0]!.reason).toMatch(/fits if it was written in MPa — likely a unit slip/)
    })

    it('flags kN typed in a kip column', () => {
      // 9000 is outside the plausible 5–5000 kip brace force; 9000 kN / 4.448222 = 2023 kip is inside (NIST SP 811 factor)
      const p = reviewsFor(t => (t.braces[0]!.required_strength = 9_000))
      expect(p.reviews.map(r => r.reason).join()).toMatch(/required_strength 9000 kip .* fits if it was written in kN/)
    })

    it('flags β and ω that look swapped', () => {
      const p = reviewsFor(t => Object.assign(t.brace_values[1]!, { beta: 1.45, omega: 1.12 }))
      expect(p.reviews.some(r => /look swapped/.test(r.reason))).toBe(true)
    })

    it('flags an angle that disagrees with the geometry', () => {
      const p = reviewsFor(t => (t.braces[0]!.angle_deg = 52))
      expect(p.reviews[0]!.reason).toMatch(/angle_deg 52° disagrees with the frame geometry \(bay width and story height give 45.0°\)/)
    })

    it('flags a chosen core below the required area', () => {
      const p = reviewsFor(t => (t.brace_values[0]!.core_area = 6.0))
      expect(p.reviews.some(r => /below the required 6.2/.test(r.reason))).toBe(true)
    })

    it('flags Ry given with a coupon yield stress (AISC 341-16 F4.2a: measured values take Ry = 1.0)', () => {
      const p = reviewsFor(t => (t.brace_values[1]!.ry = 1.3))
      expect(p.reviews.some(r => /Ry 1.3 is given with a coupon-tested yield stress/.test(r.reason))).toBe(true)
    })

    it('flags final β and ω without their deformation basis', () => {
      const p = reviewsFor(t => (t.brace_values[1]!.factor_drift_multiple = null))
      expect(p.reviews.some(r => /without the deformation they were taken at/.test(r.reason))).toBe(true)
    })
  })
})
