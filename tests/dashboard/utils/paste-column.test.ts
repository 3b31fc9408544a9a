import { describe, expect, it } from 'vitest'
import { applyColumn, parsePastedColumn, toCellNumber } from '../../../dashboard/src/utils/paste-column'
import { createLevelRow } from '../../../dashboard/src/utils/worksheet-form'

describe('toCellNumber(cell)', () => {
  it.each([
    ['14', 14],
    [' 12.5 ', 12.5],
    ['1,250.5', 1250.5],
    ['3,5', 3.5],
    ['"260"', 260],
    ['-4', -4],
    ['1e3', 1000],
    ['.75', 0.75],
  ])('reads %j as %d', (cell, value) => {
    expect(toCellNumber(cell)).toBe(value)
  })
  it.each(['', 'L1', '14 ft', '=SUM(A1:A3)', '1.2.3'])('rejects %j', cell => {
    expect(toCellNumber(cell)).toBeUndefined()
  })
})

describe('parsePastedColumn(text)', () => {
  it('reads a copied column (one value per line, CRLF, trailing newline)', () => {
    expect(parsePastedColumn('260\r\n190\r\n105\r\n')).toEqual({ values: [260, 190, 105], rejected: [] })
  })
  it('reads a copied row (tab-separated on one line)', () => {
    expect(parsePastedColumn('15\t13\t13').values).toEqual([15, 13, 13])
  })
  it('keeps the first column of a block of several columns', () => {
    expect(parsePastedColumn('15\tL1\n13\tL2\n').values).toEqual([15, 13])
  })
  it('reverses a sheet listed roof first', () => {
    expect(parsePastedColumn('105\n190\n260', { topFirst: true }).values).toEqual([260, 190, 105])
  })
  it('reports cells that are not numbers with their position, and skips blank lines', () => {
    expect(parsePastedColumn('Shear\n\n260\nn/a\n190')).toEqual({
      values: [260, 190],
      rejected: [
        { position: 1, text: 'Shear' },
        { position: 3, text: 'n/a' },
      ],
    })
  })
})

describe('applyColumn(levels, field, values)', () => {
  const rows = [createLevelRow(0, { storyHeight: 15, storyShear: 1 }), createLevelRow(1, { storyHeight: 13, storyShear: 2 })]

  it('writes from the bottom story up and keeps the other field and the row keys', () => {
    const out = applyColumn(rows, 'storyShear', [260, 190])
    expect(out.map(r => r.storyShear)).toEqual([260, 190])
    expect(out.map(r => r.storyHeight)).toEqual([15, 13])
    expect(out.map(r => r.id)).toEqual(rows.map(r => r.id))
  })
  it('adds stories named L3, L4 … when the paste is longer than the table', () => {
    const out = applyColumn(rows, 'storyHeight', [15, 13, 13, 12])
    expect(out.map(r => r.name)).toEqual(['L1', 'L2', 'L3', 'L4'])
    expect(out[3]).toMatchObject({ storyHeight: 12, storyShear: null })
  })
  it('starts at the row pasted into and leaves the rows below alone', () => {
    const out = applyColumn(rows, 'storyShear', [99], { start: 1 })
    expect(out.map(r => r.storyShear)).toEqual([1, 99])
  })
  it('stops at the story limit', () => {
    expect(applyColumn(rows, 'storyHeight', [1, 2, 3, 4, 5], { maxLevels: 3 })).toHaveLength(3)
  })
  it('does not change the rows it was given', () => {
    applyColumn(rows, 'storyShear', [7, 8])
    expect(rows.map(r => r.storyShear)).toEqual([1, 2])
  })
})
