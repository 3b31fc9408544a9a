import type { Db } from '../../api/src/db'
import { loadProjects, upsertSuppliers } from '../../etl/src/load'
import { transform } from '../../etl/src/transform'
import type { RawCell } from '../../etl/src/readers/types'
import { bundle, validProject } from '../etl/bundle-builder'

type Tables = Record<string, Record<string, RawCell>[]>

/**
 * A hand-made project: `validProject(code)` (two-story inverted V, frame A, 300 / 180 kip story shears,
 * L2 assumed 6.5 in² and final coupon 6.5 in², 40 000 ft²) with its project row and tonnage overridden.
 */
export function handProject(code: string, project: Record<string, RawCell> = {}, tonnage?: Record<string, RawCell>[]): Tables {
  const t = validProject(code)
  Object.assign(t.projects[0]!, project)
  if (tonnage) t.tonnage = tonnage.map(r => ({ project_code: code, ...r }))
  return t as Tables
}

/** Loads hand-made projects through the real transform and loader; throws if any was rejected. */
export async function loadHandProjects(db: Db, sets: Tables[]): Promise<void> {
  const merged: Tables = {}
  for (const set of sets) for (const [k, rows] of Object.entries(set)) merged[k] = [...(merged[k] ?? []), ...rows]
  const seen = new Set<unknown>()
  merged.suppliers = (merged.suppliers ?? []).filter(s => !seen.has(s.supplier_code) && seen.add(s.supplier_code))
  const a = transform([bundle(merged)])
  const errors = a.problems.filter(p => p.severity === 'error')
  if (errors.length) throw new Error(`hand-made history rejected: ${errors.map(e => e.message).join('; ')}`)
  await upsertSuppliers(db, a.suppliers)
  const r = await loadProjects(db, a.projects)
  if (r.failed.length) throw new Error(`could not load: ${JSON.stringify(r.failed)}`)
}
