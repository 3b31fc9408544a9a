/** The synthetic history of the benchmarks, varied deterministically so statistics are not degenerate. */
export type Row = Record<string, string | number>

/** Deterministic pseudo-random numbers in [0, 1): the demo firm's mulberry32. */
import { mulberry32 } from '../demo-firm/random'
export const rng = mulberry32

export const SUPPLIERS = ['BS-A', 'BS-B', 'BS-C', 'BS-D']
const EDITIONS: [number, string][] = [[2011, '341-05'], [2017, '341-10'], [2024, '341-16'], [9999, '341-22']]
export const CONFIGS = ['inverted_v', 'v']
const USES = ['office', 'laboratory', 'healthcare', 'school', 'residential', 'parking']
const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v))
const r3 = (v: number) => Math.round(v * 1000) / 1000

/** Varies the uniform synthetic rows, keeping every value inside the loader's plausible bands. */
export function perturb(t: Record<string, Row[]>, seed: number): Record<string, Row[]> {
  const rand = rng(seed)
  t.suppliers = SUPPLIERS.map(code => ({ supplier_code: code, display_name: `Bench supplier ${code.slice(-1)}` }))
  const projectSupplier = new Map<string, number>()
  for (const p of t.projects!) {
    const s = Math.floor(rand() * SUPPLIERS.length)
    const year = Number(p.year_designed)
    projectSupplier.set(String(p.project_code), s)
    Object.assign(p, {
      supplier_code: SUPPLIERS[s]!,
      office: ['North', 'South', 'Coast'][Math.floor(rand() * 3)]!,
      building_use: USES[Math.floor(rand() * USES.length)]!,
      sdc: ['C', 'D', 'E'][Math.floor(rand() * 3)]!,
      aisc341_edition: EDITIONS.find(([upTo]) => year <= upTo)![1],
      stories: 10,
      year_completed: year + 1 + Math.floor(rand() * 2),
    })
  }
  for (const f of t.frames!) f.configuration = CONFIGS[Math.floor(rand() * CONFIGS.length)]!
  for (const v of t.brace_values!) {
    const s = projectSupplier.get(String(v.project_code))!
    if (v.phase === 'sd') {
      Object.assign(v, { beta: r3(1.08 + rand() * 0.07), omega: r3(1.3 + rand() * 0.12), stiffness_factor: r3(1.3 + rand() * 0.2) })
    } else {
      Object.assign(v, {
        beta: r3(clamp(1.05 + 0.04 * s + (rand() - 0.5) * 0.12, 1.0, 1.3)),
        omega: r3(clamp(1.35 + 0.03 * s + (rand() - 0.5) * 0.16, 1.0, 1.8)),
        fysc: r3(clamp(40 + 2 * s + (rand() - 0.5) * 6, 30, 65)),
        stiffness_factor: r3(clamp(1.35 + 0.05 * s + (rand() - 0.5) * 0.3, 1.0, 2.0)),
        core_area: Number(v.core_area) + (rand() < 0.15 ? 0.25 : 0),
      })
    }
  }
  for (const w of t.tonnage!) w.weight = r3(Number(w.weight) * (0.7 + rand() * 0.6))
  t.tonnage!.push(...t.projects!.map(p => ({ project_code: p.project_code!, stage: 'preliminary', category: 'lateral_total', weight: r3(110 + rand() * 40) })))
  return t
}
