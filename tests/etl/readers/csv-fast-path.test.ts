import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { parseQuoted, readCsv, splitPlain } from '../../../etl/src/readers/csv'

// The unquoted fast path must return exactly the records (and start lines) that csv-parse — the
// general-purpose reference parser from npm — returns for the same text with the loader's options.

const cell = fc.stringMatching(/^[A-Za-z0-9 .\-_[\]]{0,8}$/)
const line = fc.oneof(
  { weight: 6, arbitrary: fc.array(cell, { minLength: 1, maxLength: 6 }) },
  { weight: 1, arbitrary: fc.constant('') },
  { weight: 1, arbitrary: fc.constant('# a comment line') },
)

describe('CSV fast path for files without quotes', () => {
  it('agrees with csv-parse on records and start lines (property)', () => {
    fc.assert(
      fc.property(fc.array(line, { minLength: 1, maxLength: 30 }), fc.constantFrom(',', ';', '\t'), (ls, delimiter) => {
        const lines = ls.map(l => (Array.isArray(l) ? l.join(delimiter) : l))
        // Both paths see the body after the file's leading comment/blank lines, as readCsv gives it.
        let skipped = 0
        while (skipped < lines.length && (lines[skipped]!.trim() === '' || lines[skipped]!.trim().startsWith('#'))) skipped++
        const body = lines.slice(skipped).join('\n')
        const fast = splitPlain(lines, skipped, delimiter)
        const reference = parseQuoted('x.csv', body, delimiter, skipped)
        expect(fast).toEqual(reference)
      }),
      { numRuns: 300 },
    )
  })

  it('reads the same table whichever path a file takes', () => {
    const plain = ['# units: us', 'project_code,name,stories', 'AA-1,North wing,4', '', 'AA-2,South wing,6'].join('\r\n')
    // The same content with one quoted field goes through csv-parse.
    const quoted = plain.replace('North wing', '"North wing"')
    const a = readCsv('projects.csv', plain).tables[0]!
    const b = readCsv('projects.csv', quoted).tables[0]!
    expect(a.rows).toEqual(b.rows)
    // Lines count the declaration and blank lines: AA-2 is on line 5 of the file.
    expect(a.rows.map(r => r.line)).toEqual([3, 5])
  })
})
