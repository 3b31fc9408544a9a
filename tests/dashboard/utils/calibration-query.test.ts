import { describe, expect, it } from 'vitest'
import { CalibrationFilters } from '@shared/schemas/calibration'
import {
  activeFilterCount,
  apiQueryString,
  filtersFromQuery,
  filtersToQuery,
  viewStateFromQuery,
  viewStateToQuery,
  type CalibrationViewState,
} from '../../../dashboard/src/utils/calibration-query'

describe('URL query ⇄ calibration view state', () => {
  const state: CalibrationViewState = {
    filters: {
      yearFrom: 2012,
      yearTo: 2020,
      supplier: ['SUP-A', 'SUP-C'],
      use: ['office'],
      sdc: ['D', 'E'],
      codeEdition: ['2016'],
      configuration: ['inverted_v'],
      storiesMin: 3,
      storiesMax: 12,
      coreAreaMin: 2.5,
      coreAreaMax: 10,
      phase: 'dd',
    },
    quantity: 'beta',
    groupBy: 'office',
  }

  it('comes back unchanged after a round trip through the query (every field set)', () => {
    const query = viewStateToQuery(state)
    // Lists are comma-separated, as the shared contract reads them.
    expect(query.supplier).toBe('SUP-A,SUP-C')
    expect(query.phase).toBe('dd')
    expect(viewStateFromQuery(query)).toEqual(state)
  })

  it('is read back the same after passing through a real URL (URLSearchParams encoding)', () => {
    const url = new URL(`https://x.test/calibration?${new URLSearchParams(viewStateToQuery(state)).toString()}`)
    const query = Object.fromEntries(url.searchParams)
    expect(viewStateFromQuery(query)).toEqual(state)
  })

  it('leaves the defaults out, so the plain address is the default view', () => {
    expect(viewStateToQuery({ filters: { phase: 'sd' }, quantity: 'cmax', groupBy: 'supplier' })).toEqual({})
    expect(viewStateFromQuery({})).toEqual({ filters: { phase: 'sd' }, quantity: 'cmax', groupBy: 'supplier' })
  })

  it('drops only the bad fields of a hand-edited address', () => {
    const s = viewStateFromQuery({ yearFrom: 'soon', yearTo: '2019', phase: 'xx', quantity: 'weight', groupBy: 'colour', supplier: 'SUP-B' })
    expect(s.filters).toEqual({ yearTo: 2019, supplier: ['SUP-B'], phase: 'sd' })
    expect(s.quantity).toBe('cmax')
    expect(s.groupBy).toBe('supplier')
    // Out of the schema's range (1900–2100) is dropped too.
    expect(filtersFromQuery({ yearFrom: '1850' })).toEqual({ phase: 'sd' })
  })

  it('accepts a list given as repeated parameters (vue-router gives an array)', () => {
    expect(filtersFromQuery({ supplier: ['SUP-A', 'SUP-B'] }).supplier).toEqual(['SUP-A', 'SUP-B'])
  })

  it('produces queries the shared schema itself accepts', () => {
    // The API parses the same string with CalibrationFilters (lists split at commas).
    const q = filtersToQuery(state.filters)
    expect(CalibrationFilters.parse(q)).toEqual(state.filters)
  })

  it('builds an API query string with the endpoint parameters first', () => {
    expect(apiQueryString({ phase: 'sd' })).toBe('')
    expect(apiQueryString({ phase: 'sd', supplier: ['A', 'B'] }, { quantity: 'beta', groupBy: undefined })).toBe('?quantity=beta&supplier=A%2CB')
  })

  it('counts a range given at both ends as one active filter', () => {
    // yearFrom+yearTo = 1, supplier = 1, phase dd = 1 → 3
    expect(activeFilterCount({ yearFrom: 2010, yearTo: 2015, supplier: ['A'], phase: 'dd' })).toBe(3)
    expect(activeFilterCount({ phase: 'sd' })).toBe(0)
  })
})
