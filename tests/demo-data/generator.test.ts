import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { kipToKn } from '@shared/units/force'
import { approximatePeriod, distributionExponent, seismicResponseCoefficient, storyShears, verticalDistribution } from '../../scripts/demo-firm/elf'
import { generateDemoFirm } from '../../scripts/demo-firm/firm'
import { mulberry32, Random } from '../../scripts/demo-firm/random'
import { readDemoFolder, type ParsedFile } from '../../scripts/demo-firm/read'
import type { Cell, DemoTables, FaultId, Row } from '../../scripts/demo-firm/tables'
import { ARROW_FILE, CSV_FOLDER, planFiles, tableCells, writeDemoFirm } from '../../scripts/demo-firm/write'

const DEMO_DIR = join(import.meta.dirname, '../../demo-data')
const t: DemoTables = generateDemoFirm(2026)

type Key = { project_code: Cell; frame_line: Cell; level: Cell }
const key = (r: Key) => `${r.project_code}|${r.frame_line}|${r.level}`
const faultOf = (id: FaultId) => t.faults.find((f) => f.id === id)!
const faultProjects = new Set(t.faults.map((f) => f.project_code))
const num = (v: Cell) => v as number

/** Expected core yield of a snapshot: Ry·Fysc (specified minimum), Fysc,max (yield range) or the coupon value with Ry = 1 (AISC 341-16 F4.2a and the Ry exception, from memory). */
const expectedYield = (r: Row<'brace_values'>) =>
  r.fysc_basis === 'coupon' ? num(r.fysc) : r.fysc_basis === 'yield_range' ? num(r.fysc_max) : num(r.ry) * num(r.fysc)
/** Adjusted compression βωRyPysc on the snapshot's own numbers (AISC 341-16 F4.2a, form partly verified). */
const adjustedCompression = (r: Row<'brace_values'>) => num(r.beta) * num(r.omega) * expectedYield(r) * num(r.core_area)

describe('seeded random helpers', () => {
  it('mulberry32 repeats for a seed and differs between seeds', () => {
    const a = mulberry32(1)
    const b = mulberry32(1)
    const c = mulberry32(2)
    const xs = [a(), a(), a()]
    expect([b(), b(), b()]).toEqual(xs)
    expect(c()).not.toBe(xs[0])
    for (const x of xs) expect(x >= 0 && x < 1).toBe(true)
  })

  it('triangular and normal stay plausible over many draws', () => {
    const rng = new Random(99)
    const tri = Array.from({ length: 4000 }, () => rng.triangular(0, 1, 4))
    expect(Math.min(...tri)).toBeGreaterThanOrEqual(0)
    expect(Math.max(...tri)).toBeLessThanOrEqual(4)
    // Mean of a triangular distribution is (a + c + b)/3 = 5/3 (derived).
    expect(tri.reduce((s, x) => s + x, 0) / tri.length).toBeCloseTo(5 / 3, 1)
    const normals = Array.from({ length: 4000 }, () => rng.normal(10, 2))
    expect(normals.reduce((s, x) => s + x, 0) / normals.length).toBeCloseTo(10, 0)
  })
})

describe('ELF (ASCE 7-16 §12.8)', () => {
  it('Ta = Ct·hn^x with Ct 0.03, x 0.75 for BRBF', () => {
    // ASCE 7-16 Table 12.8-2 (partly verified, engineering reference §2): 0.03 × 100^0.75 = 0.03 × 31.6228 = 0.948683 s.
    expect(approximatePeriod(100)).toBeCloseTo(0.948683, 6)
  })

  it('Cs = SDS/(R/Ie) capped by SD1/(T·R/Ie) and floored at 0.044·SDS·Ie', () => {
    // ASCE 7-16 Eqs. 12.8-2, 12.8-3, 12.8-5 (from memory). SDS 1.0, SD1 0.6, R 8, Ie 1, T 0.948683 s:
    // 1.0/8 = 0.125; 0.6/(0.948683 × 8) = 0.079057 governs.
    expect(seismicResponseCoefficient({ sds: 1, sd1: 0.6, s1: 0.5, r: 8, ie: 1, periodS: 0.948683, tlS: 8 })).toBeCloseTo(0.079057, 6)
    // Short period: SDS/(R/Ie) = 1.0/(8/1.5) = 0.1875.
    expect(seismicResponseCoefficient({ sds: 1, sd1: 0.6, s1: 0.5, r: 8, ie: 1.5, periodS: 0.2, tlS: 8 })).toBeCloseTo(0.1875, 10)
    // Long period, low SD1: floor 0.044 × 0.45 × 1 = 0.0198.
    expect(seismicResponseCoefficient({ sds: 0.45, sd1: 0.15, s1: 0.1, r: 8, ie: 1, periodS: 2, tlS: 8 })).toBeCloseTo(0.0198, 10)
    // S1 ≥ 0.6 g: at least 0.5·S1/(R/Ie) = 0.5 × 0.8 / 8 = 0.05 (Eq. 12.8-6), above SD1/(T·R) = 0.025 and 0.044 × 0.9 = 0.0396.
    expect(seismicResponseCoefficient({ sds: 0.9, sd1: 0.4, s1: 0.8, r: 8, ie: 1, periodS: 2, tlS: 8 })).toBeCloseTo(0.05, 10)
  })

  it('k is 1 up to 0.5 s, 2 from 2.5 s, linear between (ASCE 7-16 §12.8.3)', () => {
    expect(distributionExponent(0.4)).toBe(1)
    expect(distributionExponent(1.5)).toBe(1.5)
    expect(distributionExponent(3)).toBe(2)
  })

  it('Cvx = wx·hx^k / Σ wi·hi^k and Vx = Σ Fi above (ASCE 7-16 Eqs. 12.8-11, 12.8-12)', () => {
    // Two equal floors at 10 ft and 20 ft, k = 1: Cvx = 1/3 and 2/3 of 300 kip.
    const f = verticalDistribution([100, 100], [10, 20], 300, 1)
    expect(f[0]).toBeCloseTo(100, 10)
    expect(f[1]).toBeCloseTo(200, 10)
    expect(storyShears(f)).toEqual([300, 200])
    // k = 2: 100·10² : 100·20² = 1 : 4.
    const g = verticalDistribution([100, 100], [10, 20], 500, 2)
    expect(g[0]).toBeCloseTo(100, 10)
  })
})

describe('generateDemoFirm', () => {
  it('is deterministic for a seed and differs for another seed', () => {
    expect(generateDemoFirm(2026)).toEqual(t)
    const other = generateDemoFirm(7)
    expect(other.projects).not.toEqual(t.projects)
  }, 60_000)

  it('holds about 150 projects of the stated mix', () => {
    expect(t.projects.length).toBeGreaterThanOrEqual(140)
    expect(t.projects.length).toBeLessThanOrEqual(160)
    const years = t.projects.map((p) => num(p.year_designed))
    expect(Math.min(...years)).toBe(2008)
    expect(Math.max(...years)).toBe(2026)
    const stories = t.projects.map((p) => num(p.stories))
    expect(Math.min(...stories)).toBe(2)
    expect(Math.max(...stories)).toBeLessThanOrEqual(20)
    expect(Math.max(...stories)).toBeGreaterThanOrEqual(15)
    expect(new Set(t.projects.map((p) => p.sdc))).toEqual(new Set(['C', 'D', 'E', 'F']))
    expect(new Set(t.frames.map((f) => f.configuration))).toEqual(new Set(['single_diagonal', 'inverted_v', 'v', 'two_story_x']))
    expect(new Set(t.projects.map((p) => p.supplier_code))).toEqual(new Set(['SUP-A', 'SUP-B', 'SUP-C', 'SUP-D']))
    expect(new Set(t.projects.map((p) => p.office))).toEqual(new Set(['North', 'South', 'Coast']))
    expect(new Set(t.projects.map((p) => p.building_use)).size).toBe(8)
    expect(new Set(t.projects.map((p) => p.asce7_edition))).toEqual(new Set(['7-05', '7-10', '7-16', '7-22']))
    const confidential = t.projects.filter((p) => p.client_confidential === 'yes').length / t.projects.length
    expect(confidential).toBeGreaterThan(0.3)
    expect(confidential).toBeLessThan(0.5)
    for (const p of t.projects) if (p.client_confidential === 'yes') expect(p.benchmark_permitted).toBe('no')
  })

  it('uses the code edition of its era and its system coefficients', () => {
    for (const p of t.projects) {
      const year = num(p.year_designed)
      if (year <= 2010) expect(p.asce7_edition).toBe('7-05')
      if (year >= 2018) expect(['7-16', '7-22']).toContain(p.asce7_edition)
      if (p.asce7_edition === '7-22') expect(year).toBeGreaterThanOrEqual(2024)
      // ASCE 7-05 Table 12.2-1 BRBF rows: R 7 / Cd 5.5 or R 8 / Cd 5; later editions R 8, Ω0 2.5, Cd 5 (engineering reference §2 [P]).
      if (p.asce7_edition === '7-05') expect([7, 8]).toContain(p.r)
      else expect([p.r, p.omega0, p.cd]).toEqual([8, 2.5, 5])
      // Ie by risk category (ASCE 7-16 Table 1.5-2, from memory).
      expect(p.importance_factor).toBe({ I: 1, II: 1, III: 1.25, IV: 1.5 }[p.risk_category as string])
      if (p.sdc === 'F') expect(p.risk_category).toBe('IV')
      if (p.phase_reached === 'complete') {
        expect(num(p.year_completed) - year).toBeGreaterThanOrEqual(1)
        expect(num(p.year_completed) - year).toBeLessThanOrEqual(3)
      } else expect(p.year_completed).toBeNull()
    }
  })

  it('has 2–6 frame lines per direction, 1–3 bays, bay widths 20–35 ft and story heights 12–18 ft', () => {
    for (const p of t.projects) {
      const frames = t.frames.filter((f) => f.project_code === p.project_code)
      const x = frames.filter((f) => /^[A-F]$/.test(String(f.frame_line))).length
      const y = frames.filter((f) => /^[1-6]$/.test(String(f.frame_line))).length
      expect(x + y).toBe(frames.length)
      for (const n of [x, y]) expect(n >= 2 && n <= 6).toBe(true)
    }
    for (const f of t.frames) {
      expect(num(f.bays)).toBeGreaterThanOrEqual(1)
      expect(num(f.bays)).toBeLessThanOrEqual(3)
      expect(num(f.bay_width)).toBeGreaterThanOrEqual(20)
      expect(num(f.bay_width)).toBeLessThanOrEqual(35)
    }
    for (const l of t.levels) {
      if (l.story_height === null) continue // the planted hard error
      expect(num(l.story_height)).toBeGreaterThanOrEqual(12)
      expect(num(l.story_height)).toBeLessThanOrEqual(18)
    }
  })

  it('has story shears that never decrease toward the base in any frame (ELF, ASCE 7-16 §12.8.4)', () => {
    const byFrame = new Map<string, Row<'levels'>[]>()
    for (const l of t.levels) {
      const k = `${l.project_code}|${l.frame_line}`
      byFrame.set(k, [...(byFrame.get(k) ?? []), l])
    }
    expect(byFrame.size).toBe(t.frames.length)
    for (const levels of byFrame.values()) {
      const sorted = [...levels].sort((a, b) => num(a.level_index) - num(b.level_index))
      sorted.forEach((l, i) => expect(l.level_index).toBe(i + 1))
      for (let i = 0; i + 1 < sorted.length; i++) expect(num(sorted[i]!.story_shear)).toBeGreaterThanOrEqual(num(sorted[i + 1]!.story_shear))
      expect(num(sorted[sorted.length - 1]!.story_shear)).toBeGreaterThan(0)
    }
  })

  it('never rounds an sd core down: core_area ≥ required_core_area (common practice, no source)', () => {
    const sd = t.brace_values.filter((r) => r.phase === 'sd')
    expect(sd.length).toBe(t.braces.length)
    for (const r of sd) expect(num(r.core_area)).toBeGreaterThanOrEqual(num(r.required_core_area))
    // Finals too: the supplier rounds up on its own increments.
    for (const r of t.brace_values.filter((v) => v.phase === 'submittal')) expect(num(r.core_area)).toBeGreaterThanOrEqual(num(r.required_core_area))
  })

  it('has supplier cores mostly equal to the preliminary size and sometimes a step off', () => {
    const sd = new Map(t.brace_values.filter((r) => r.phase === 'sd').map((r) => [key(r), num(r.core_area)]))
    const rev0 = t.brace_values.filter((r) => r.phase === 'submittal' && r.revision === 0)
    const same = rev0.filter((r) => num(r.core_area) === sd.get(key(r))).length
    expect(same).toBeGreaterThan(0.6 * rev0.length)
    expect(same).toBeLessThan(0.95 * rev0.length)
  })

  it('sizes the sd core from the required strength: Asc,req = Pu/(0.9·Fysc) (AISC 341 F4.5b, from memory)', () => {
    const braces = new Map(t.braces.map((b) => [key(b), b]))
    for (const r of t.brace_values.filter((v) => v.phase === 'sd')) {
      const pu = num(braces.get(key(r))!.required_strength) // rounded to 0.1 kip in the file
      expect(num(r.required_core_area)).toBeCloseTo(pu / (0.9 * num(r.fysc)), 1)
    }
  })

  it('gives sd adjusted strengths equal to ω·(expected yield)·Asc and β times that (AISC 341-16 F4.2a)', () => {
    const swapped = faultOf('beta_omega_swap')
    const strengths = new Map(t.adjusted_strengths.map((a) => [`${key(a)}|${a.phase}|${a.revision}`, a]))
    let checked = 0
    for (const r of t.brace_values) {
      if (r.phase !== 'sd' || (r.project_code === swapped.project_code && key(r) === key({ ...swapped, frame_line: swapped.frame_line!, level: swapped.level! }))) continue
      const a = strengths.get(`${key(r)}|sd|0`)!
      const tension = num(r.omega) * expectedYield(r) * num(r.core_area)
      expect(Math.abs(a.adjusted_tension - tension)).toBeLessThanOrEqual(1e-9 * tension)
      expect(Math.abs(a.adjusted_compression - num(r.beta) * tension)).toBeLessThanOrEqual(1e-9 * tension)
      checked++
    }
    expect(checked).toBe(t.braces.length - 1)
  })

  it('has governing finals both above and below the sd assumption in adjusted compression', () => {
    const sd = new Map(t.brace_values.filter((r) => r.phase === 'sd').map((r) => [key(r), adjustedCompression(r)]))
    const ratios = t.brace_values
      .filter((r) => r.governing === 'yes' && !faultProjects.has(r.project_code as string))
      .map((r) => adjustedCompression(r) / sd.get(key(r))!)
    const above = ratios.filter((x) => x > 1).length
    const below = ratios.filter((x) => x < 1).length
    expect(above).toBeGreaterThan(0.03 * ratios.length) // unconservative assumptions exist
    expect(below).toBeGreaterThan(0.5 * ratios.length) // most assumptions were conservative
  })

  it('keeps final factors in the literature ranges and uses 2.0 × design drift for finals', () => {
    for (const r of t.brace_values) {
      if (r.phase === 'sd') continue
      expect(r.factor_drift_multiple).toBe(2)
      // β 1.0–1.3 (AISC 341 K3.8 limit, from memory); ω about 1.2–1.6 (engineering reference §5, from memory).
      expect(num(r.beta)).toBeGreaterThanOrEqual(1)
      expect(num(r.beta)).toBeLessThanOrEqual(1.3)
      expect(num(r.omega)).toBeGreaterThanOrEqual(1.15)
      expect(num(r.omega)).toBeLessThanOrEqual(1.75)
      if (r.phase === 'coupon') {
        expect(r.fysc_basis).toBe('coupon')
        expect(r.ry).toBeNull()
      }
    }
  })

  it('marks exactly one governing snapshot per brace, except the pending project', () => {
    const pending = faultOf('pending_final').project_code
    const governing = new Map<string, Row<'brace_values'>[]>()
    const snapshots = new Map<string, Row<'brace_values'>[]>()
    for (const r of t.brace_values) {
      snapshots.set(key(r), [...(snapshots.get(key(r)) ?? []), r])
      if (r.governing === 'yes') governing.set(key(r), [...(governing.get(key(r)) ?? []), r])
    }
    for (const b of t.braces) {
      const g = governing.get(key(b)) ?? []
      expect(g.length).toBe(b.project_code === pending ? 0 : 1)
      if (g.length === 0) continue
      const phases = (snapshots.get(key(b)) ?? []).map((r) => r.phase)
      const expected = phases.includes('coupon') ? 'coupon' : phases.includes('approved') ? 'approved' : 'submittal'
      expect(g[0]!.phase).toBe(expected)
    }
    // Construction projects have no coupon data.
    const construction = new Set(t.projects.filter((p) => p.phase_reached === 'construction').map((p) => p.project_code))
    expect(construction.size).toBeGreaterThan(3)
    for (const r of t.brace_values) if (construction.has(r.project_code)) expect(r.phase).not.toBe('coupon')
  })

  it('has tonnage that adds up, fits the psf rules of thumb and moves with the final adjusted strengths', () => {
    const byProject = new Map<string, Row<'tonnage'>[]>()
    for (const r of t.tonnage) byProject.set(r.project_code as string, [...(byProject.get(r.project_code as string) ?? []), r])
    const psf: number[] = []
    for (const p of t.projects) {
      const rows = byProject.get(p.project_code as string)!
      const w = (stage: string, category: string) => num(rows.find((r) => r.stage === stage && r.category === category)!.weight)
      const stages = p.project_code === faultOf('pending_final').project_code ? ['preliminary'] : ['preliminary', 'final']
      expect(new Set(rows.map((r) => r.stage))).toEqual(new Set(stages))
      for (const s of stages) {
        const parts = w(s, 'braces') + w(s, 'beams') + w(s, 'columns') + w(s, 'connections')
        expect(w(s, 'lateral_total')).toBeCloseTo(parts, 1)
        expect(w(s, 'structural_total')).toBeGreaterThan(w(s, 'lateral_total'))
      }
      psf.push((w('preliminary', 'structural_total') * 2000) / num(p.floor_area))
    }
    // Rules of thumb, engineering reference §8 (from memory): total 7–16 psf typical; outlier check < 4 or > 30 psf.
    for (const x of psf) expect(x > 4 && x < 30).toBe(true)
    expect(psf.filter((x) => x >= 7 && x <= 16).length).toBeGreaterThan(0.8 * psf.length)
    // Frame members (beams, columns, connections) follow the governing adjusted strengths: projects whose every
    // governing brace is below its assumption end with less frame steel than estimated, and the reverse.
    const sd = new Map(t.brace_values.filter((r) => r.phase === 'sd').map((r) => [key(r), adjustedCompression(r)]))
    let lower = 0
    let higher = 0
    for (const p of t.projects) {
      if (faultProjects.has(p.project_code as string)) continue
      const ratios = t.brace_values.filter((r) => r.project_code === p.project_code && r.governing === 'yes').map((r) => adjustedCompression(r) / sd.get(key(r))!)
      if (ratios.length === 0) continue
      const rows = byProject.get(p.project_code as string)!
      const frame = (stage: string) => rows.filter((r) => r.stage === stage && ['beams', 'columns', 'connections'].includes(r.category as string)).reduce((s, r) => s + num(r.weight), 0)
      if (ratios.every((x) => x < 0.97)) {
        expect(frame('final')).toBeLessThan(frame('preliminary'))
        lower++
      }
      if (ratios.every((x) => x > 1.03)) {
        expect(frame('final')).toBeGreaterThan(frame('preliminary'))
        higher++
      }
    }
    expect(lower).toBeGreaterThan(10)
    expect(higher).toBeGreaterThanOrEqual(1)
  })
})

describe('planted faults (demo-data/README.md)', () => {
  const readme = readFileSync(join(DEMO_DIR, 'README.md'), 'utf8')
  const listed = new Map(
    [...readme.matchAll(/^\| `(\w+)` [^|]*\| `([A-Z]{2}-\d{4}-\d{3})`/gm)].map((m) => [m[1] as FaultId, m[2]!]),
  )
  const bv = (code: string) => t.brace_values.filter((r) => r.project_code === code)

  it('lists all seven faults with the project codes the generator planted', () => {
    expect(listed.size).toBe(7)
    for (const f of t.faults) expect(listed.get(f.id)).toBe(f.project_code)
  })

  it('(a) a coupon fysc of 3.8 where 38 ksi was meant', () => {
    const code = listed.get('unit_slip')!
    const coupons = bv(code).filter((r) => r.phase === 'coupon')
    expect(coupons.filter((r) => r.fysc === 3.8)).toHaveLength(1)
    for (const r of coupons) if (r.fysc !== 3.8) expect(num(r.fysc)).toBeGreaterThanOrEqual(38)
    expect(coupons.some((r) => r.fysc === 38)).toBe(true) // the same heat, typed right elsewhere
  })

  it('(b) an MPa value (290) in a ksi column of a US file', () => {
    const code = listed.get('mpa_in_ksi')!
    const f = faultOf('mpa_in_ksi')
    const hit = bv(code).filter((r) => r.fysc === 290)
    expect(hit).toHaveLength(1)
    expect(Math.round(42.1 * 6.894757293168)).toBe(290) // 1 ksi = 6.894757 MPa (NIST SP 811)
    expect(f.intended).toBe(42.1)
    expect(t.about.find((r) => r.key === 'units')!.value).toBe('us')
  })

  it('(c) the same building under two project codes', () => {
    const f = faultOf('duplicate_project')
    const copy = t.projects.find((p) => p.project_code === listed.get('duplicate_project'))!
    const orig = t.projects.find((p) => p.project_code === f.duplicate_of)!
    expect(copy.project_code).not.toBe(orig.project_code)
    for (const c of ['name', 'stories', 'floor_area', 'year_designed'] as const) expect(copy[c]).toBe(orig[c])
    expect(t.projects.filter((p) => p.name === orig.name)).toHaveLength(2)
    expect(t.frames.filter((r) => r.project_code === copy.project_code).length).toBe(t.frames.filter((r) => r.project_code === orig.project_code).length)
  })

  it('(d) a project still in construction with no submittal (pending)', () => {
    const code = listed.get('pending_final')!
    expect(t.projects.find((p) => p.project_code === code)!.phase_reached).toBe('construction')
    const rows = bv(code)
    expect(rows.length).toBeGreaterThan(0)
    expect(new Set(rows.map((r) => r.phase))).toEqual(new Set(['sd']))
    expect(rows.every((r) => r.governing === null)).toBe(true)
  })

  it('(e) a revised submittal whose rev 1 governs', () => {
    const code = listed.get('revised_submittal')!
    const rows = bv(code)
    expect(new Set(rows.map((r) => `${r.phase}${r.revision ?? ''}`))).toEqual(new Set(['sd', 'submittal0', 'submittal1']))
    const gov = rows.filter((r) => r.governing === 'yes')
    expect(gov.length).toBe(t.braces.filter((b) => b.project_code === code).length)
    for (const r of gov) expect([r.phase, r.revision]).toEqual(['submittal', 1])
    // Other projects with a rev 1 exist too (about 15 %).
    const revised = new Set(t.brace_values.filter((r) => r.revision === 1).map((r) => r.project_code))
    expect(revised.size / t.projects.length).toBeGreaterThan(0.07)
    expect(revised.size / t.projects.length).toBeLessThan(0.25)
  })

  it('(f) β and ω swapped in one snapshot (β 1.4, ω 1.1)', () => {
    const code = listed.get('beta_omega_swap')!
    const swapped = bv(code).filter((r) => r.beta === 1.4 && r.omega === 1.1)
    expect(swapped).toHaveLength(1)
    expect(swapped[0]!.phase).toBe('sd')
    for (const r of bv(code).filter((x) => x.phase === 'sd' && x !== swapped[0])) expect([r.beta, r.omega]).toEqual([1.1, 1.4])
    expect(t.brace_values.filter((r) => num(r.beta) > num(r.omega))).toHaveLength(1) // β > ω nowhere else
  })

  it('(g) one levels row with an empty story_height', () => {
    const code = listed.get('empty_story_height')!
    const empty = t.levels.filter((l) => l.story_height === null)
    expect(empty).toHaveLength(1)
    expect(empty[0]!.project_code).toBe(code)
  })
})

describe('committed files in demo-data/', () => {
  let tmp = ''
  let committed: Record<string, ParsedFile> = {}
  let fresh: Record<string, ParsedFile> = {}

  beforeAll(async () => {
    tmp = mkdtempSync(join(tmpdir(), 'demo-firm-'))
    await writeDemoFirm(generateDemoFirm(2026), tmp)
    committed = await readDemoFolder(DEMO_DIR)
    fresh = await readDemoFolder(tmp)
  }, 120_000)
  afterAll(() => rmSync(tmp, { recursive: true, force: true }))

  it('were generated by the current generator (parsed rows equal a fresh run)', () => {
    expect(Object.keys(committed).sort()).toEqual(Object.keys(fresh).sort())
    expect(committed).toEqual(fresh)
    expect(readFileSync(join(DEMO_DIR, 'README.md'), 'utf8')).toBe(readFileSync(join(tmp, 'README.md'), 'utf8'))
  })

  it('hold exactly the generator tables, file by file', () => {
    for (const file of planFiles(t)) {
      const parsed = committed[file.path]!
      for (const name of Object.keys(file.tables) as (keyof typeof file.tables)[]) {
        const { header, rows } = tableCells(file, name)
        expect(parsed[name]!.header).toEqual(header)
        expect(parsed[name]!.rows).toEqual(rows.map((r) => r.map((v) => (v === null ? '' : String(v)))))
      }
    }
  })

  it('declare units: about sheets us, Arrow metadata brace_values/us, one SI column in the CSV levels', () => {
    for (const path of ['north-office-2008-2019.xlsx', 'south-and-coast-2008-2019.xlsx', CSV_FOLDER]) {
      expect(committed[path]!.about!.rows).toContainEqual(['units', 'us'])
      expect(committed[path]!.about!.rows).toContainEqual(['format', 'backsight-history'])
    }
    const meta = committed[ARROW_FILE]!.schema_metadata!
    const m = Object.fromEntries(meta.header.map((h, i) => [h, meta.rows[0]![i]]))
    expect(m).toMatchObject({ table: 'brace_values', units: 'us' })
    const levels = committed[CSV_FOLDER]!.levels!
    const col = levels.header.indexOf('story_shear [kN]')
    expect(col).toBeGreaterThan(0)
    // kip → kN × 4.4482216152605 (NIST SP 811 exact bases), written to 0.01 kN.
    const kip = new Map(t.levels.map((l) => [`${l.project_code}|${l.frame_line}|${l.level}`, num(l.story_shear)]))
    for (const r of levels.rows) expect(Math.abs(Number(r[col]) - kipToKn(kip.get(`${r[0]}|${r[1]}|${r[2]}`)!))).toBeLessThanOrEqual(0.005 + 1e-9)
  })

  it('merge to every project once: the Arrow file carries brace_values of projects whose other tables are CSV', () => {
    const arrowCodes = new Set(committed[ARROW_FILE]!.brace_values!.rows.map((r) => r[0]))
    const csvProjects = new Set(committed[CSV_FOLDER]!.projects!.rows.map((r) => r[0]))
    expect(arrowCodes.size).toBeGreaterThan(10)
    for (const c of arrowCodes) expect(csvProjects.has(c)).toBe(true)
    const all = [
      ...committed['north-office-2008-2019.xlsx']!.projects!.rows,
      ...committed['south-and-coast-2008-2019.xlsx']!.projects!.rows,
      ...committed[CSV_FOLDER]!.projects!.rows,
    ].map((r) => r[0])
    expect(all.length).toBe(t.projects.length)
    expect(new Set(all).size).toBe(t.projects.length)
  })

  it('stay under about 5 MB in total', () => {
    const size = (p: string): number => (statSync(p).isDirectory() ? readdirSync(p).reduce((s, f) => s + size(join(p, f)), 0) : statSync(p).size)
    expect(size(DEMO_DIR)).toBeLessThan(5 * 1024 * 1024)
  })
})
