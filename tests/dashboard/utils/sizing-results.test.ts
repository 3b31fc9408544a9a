import { describe, expect, it } from 'vitest'
import { sizeFrame } from '@shared/engineering/size-frame'
import { FALLBACK_SIZING_DEFAULTS } from '@shared/schemas/settings'
import { fieldLabel, toFieldMessageMap } from '../../../dashboard/src/utils/field-messages'
import { compareResults, formatNumber, unitLabel } from '../../../dashboard/src/utils/sizing-results'
import { createLevelRow, createWorksheetForm, toSizingRequest } from '../../../dashboard/src/utils/worksheet-form'

function result() {
  const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'us')
  form.bayWidth = 24
  form.levels = [createLevelRow(0, { storyHeight: 14, storyShear: 150 })]
  return sizeFrame(toSizingRequest(form))
}

describe('compareResults(local, server)', () => {
  it('finds no difference between a result and its JSON round trip', () => {
    const r = result()
    expect(compareResults(r, JSON.parse(JSON.stringify(r)))).toEqual([])
  })
  it('tolerates float noise only (relative 1e-9)', () => {
    const r = result()
    const server = structuredClone(r)
    server.levels[0]!.coreArea *= 1 + 1e-12
    expect(compareResults(r, server)).toEqual([])
    server.levels[0]!.coreArea += 0.25
    expect(compareResults(r, server)).toEqual([{ path: 'levels.0.coreArea', local: r.levels[0]!.coreArea, server: server.levels[0]!.coreArea }])
  })
  it('reports changed text, null and list lengths', () => {
    const r = result()
    const server = structuredClone(r)
    server.levels[0]!.name = 'other'
    server.cautions = server.cautions.slice(1)
    const paths = compareResults(r, server).map(d => d.path)
    expect(paths).toEqual(['cautions.length', 'levels.0.name'])
  })
})

describe('formatNumber and unitLabel', () => {
  it('formats with fixed decimals and grouping, a dash for nothing', () => {
    expect(formatNumber(2.78548, 2)).toBe('2.79')
    expect(formatNumber(1234.5, 1)).toBe('1,234.5')
    expect(formatNumber(null, 1)).toBe('—')
    expect(formatNumber(Number.NaN, 1)).toBe('—')
  })
  it('reads units from the result and hides the ratio unit', () => {
    const r = result()
    expect(unitLabel(r, 'coreArea')).toBe('in²')
    expect(unitLabel(r, 'demandCapacityRatio')).toBe('')
  })
})

describe('toFieldMessageMap and fieldLabel', () => {
  it('puts errors before warnings for the same field', () => {
    const map = toFieldMessageMap([{ field: 'beta', message: 'bad' }], [{ field: 'beta', message: 'odd' }, { field: 'omega', message: 'odd ω' }])
    expect(map).toEqual({ beta: { status: 'error', message: 'bad' }, omega: { status: 'warning', message: 'odd ω' } })
  })
  it.each([
    ['levels.2.storyHeight', 'Story 3 story height'],
    ['coreSteps.0.upTo', 'Core increments, band 1 upper bound'],
    ['capacityBasis.fyscMax', 'Fysc,max'],
    ['bayWidth', 'Bay width'],
  ])('names %s as %j', (path, label) => {
    expect(fieldLabel(path)).toBe(label)
  })
})
