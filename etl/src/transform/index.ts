import type { RawBundle } from '../readers/types'
import { assemble, type Assembled } from './assemble'
import { parseBundle } from './cells'

/** Raw tables from every file of one run → project records in stored units, and every problem found. */
export function transform(bundles: RawBundle[]): Assembled {
  const rows = []
  const problems = []
  for (const b of bundles) {
    const parsed = parseBundle(b)
    rows.push(...parsed.rows)
    problems.push(...parsed.problems)
  }
  return assemble(rows, problems)
}

export type { Assembled } from './assemble'
