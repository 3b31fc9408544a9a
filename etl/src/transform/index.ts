import type { RawBundle } from '../readers/types'
import { assemble, type Assembled } from './assemble'
import { parseBundle, type TypedRow } from './cells'
import type { ImportProblem } from '@shared/history/types'

/** Raw tables from every file of one run → project records in stored units, and every problem found. */
export function transform(bundles: RawBundle[]): Assembled {
  const rows: TypedRow[] = []
  const problems: ImportProblem[] = []
  for (const b of bundles) {
    const parsed = parseBundle(b)
    // Loops, not push(...): hundreds of thousands of rows exceed the argument limit.
    for (const r of parsed.rows) rows.push(r)
    for (const p of parsed.problems) problems.push(p)
  }
  return assemble(rows, problems)
}

export type { Assembled } from './assemble'
