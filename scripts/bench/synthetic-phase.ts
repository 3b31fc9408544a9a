import { CALIBRATION_QUANTITIES } from '../../shared/schemas/calibration'
import type { PhaseData } from '../../api/src/services/calibration/store'
import { rng } from './synthetic'

/**
 * A phase's columns built directly in memory (no database): `projects` projects of 1–`maxBraces`
 * braces with varied suppliers, offices, uses, SDCs, editions, stories and years (some missing),
 * two or three configurations, core areas and finals rounded so values tie, and 1–3 bases per
 * quantity. Rows of neighbouring projects are interleaved and brace ids are not in row order, as
 * after an incremental reload. For the analytics equivalence tests and the in-memory cold benchmark.
 */
export function syntheticPhase(seed: number, projects: number, maxBraces = 60): PhaseData {
  const rand = rng(seed)
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
  const maybe = <T>(v: T, pNull = 0.05): T | null => (rand() < pNull ? null : v)
  const p: PhaseData['projects'] = { id: [], code: [], name: [], supplier: [], office: [], use: [], sdc: [], edition: [], stories: [], yearDesigned: [], yearCompleted: [] }
  for (let j = 0; j < projects; j++) {
    const year = rand() < 0.03 ? null : 2005 + Math.floor(rand() * 20)
    p.id.push(1000 + j * 3)
    // Mixed case and accents so localeCompare order differs from code-unit order.
    p.code.push(`${pick(['P', 'p', 'Q', 'é'])}-${String(Math.floor(rand() * projects * 4)).padStart(5, '0')}-${j}`)
    p.name.push(`Project ${j}`)
    p.supplier.push(maybe(pick(['BS-A', 'BS-B', 'BS-C', 'BS-D', 'bs-a'])))
    p.office.push(maybe(pick(['North', 'South', 'Coast'])))
    p.use.push(maybe(pick(['office', 'laboratory', 'healthcare', 'school', 'residential', 'parking'])))
    p.sdc.push(maybe(pick(['C', 'D', 'E'])))
    p.edition.push(maybe(pick(['341-05', '341-10', '341-16', '341-22'])))
    p.stories.push(maybe(1 + Math.floor(rand() * 20)))
    p.yearDesigned.push(year)
    p.yearCompleted.push(year === null || rand() < 0.2 ? null : year + Math.floor(rand() * 3))
  }
  const rowProject: number[] = []
  for (let j = 0; j < projects; j++) {
    const braces = 1 + Math.floor(rand() * maxBraces)
    for (let b = 0; b < braces; b++) rowProject.push(j)
  }
  // Interleave neighbours: swap some rows with a row a little further on.
  for (let i = 0; i < rowProject.length; i++) {
    if (rand() < 0.1) {
      const k = Math.min(rowProject.length - 1, i + Math.floor(rand() * 80))
      ;[rowProject[i], rowProject[k]] = [rowProject[k]!, rowProject[i]!]
    }
  }
  const n = rowProject.length
  const braceId = new Int32Array(n)
  for (let i = 0; i < n; i++) braceId[i] = 1 + i * 2
  for (let i = 0; i < n; i++) {
    if (rand() < 0.05) {
      const k = Math.floor(rand() * n)
      ;[braceId[i], braceId[k]] = [braceId[k]!, braceId[i]!]
    }
  }
  const configs = ['inverted_v', 'v', 'two_story_x']
  const dict = (values: string[], w: number) => ({ codes: Int32Array.from({ length: n }, () => Math.floor(rand() * w)), values })
  const finalCoreArea = new Float64Array(n)
  for (let i = 0; i < n; i++) finalCoreArea[i] = rand() < 0.03 ? NaN : Math.round((1 + rand() * 14) * 4) / 4
  const yearDesigned = new Float64Array(n)
  const yearCompleted = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    yearDesigned[i] = p.yearDesigned[rowProject[i]!] ?? NaN
    yearCompleted[i] = p.yearCompleted[rowProject[i]!] ?? NaN
  }
  const q = {} as PhaseData['q']
  for (const quantity of CALIBRATION_QUANTITIES) {
    const nb = 1 + Math.floor(rand() * 3)
    const assumed = new Float64Array(n).fill(NaN)
    const final = new Float64Array(n).fill(NaN)
    const basis = new Int32Array(n).fill(-1)
    for (let i = 0; i < n; i++) {
      if (rand() < 0.08) continue
      basis[i] = Math.floor(rand() * rand() * nb)
      final[i] = Math.round((1 + rand() * 0.6) * 200) / 200
      assumed[i] = Math.round((1 + rand() * 0.6) * 200) / 200
    }
    q[quantity] = { assumed, final, basis, bases: ['2.0×Δbm', 'deformation basis not stated', '1.5×Δbm'].slice(0, nb) }
  }
  return {
    version: 1,
    phase: 'sd',
    n,
    braceId,
    project: Int32Array.from(rowProject),
    projects: p,
    frameLine: dict(['A', 'B', 'C', '1', '2'], 5),
    level: dict(['L1', 'L2', 'L3', 'Roof'], 4),
    configuration: dict(configs, rand() < 0.5 ? 2 : 3),
    finalCoreArea,
    yearDesigned,
    yearCompleted,
    q,
  }
}
