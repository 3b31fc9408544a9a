import { describe, expect, it } from 'vitest'
import { activeFilterCount, DEFAULT_LIST_STATE, listStateFromQuery, queryFromListState, withChange } from '../../../dashboard/src/utils/project-query'

describe('project list URL state', () => {
  it('reads the defaults from an empty query, as the API contract gives them', () => {
    expect(listStateFromQuery({})).toEqual({ page: 1, pageSize: 50, sort: 'code', order: 'asc', status: 'all' })
  })
  it('reads lists, numbers and the search, and writes back only what differs from the defaults', () => {
    const q = { q: 'SO-2025', yearFrom: '2015', yearTo: '2020', supplier: 'SUP-A,SUP-B', use: 'office', sdc: 'D,E', configuration: 'inverted_v', status: 'draft', page: '3', sort: 'yearDesigned', order: 'desc' }
    const s = listStateFromQuery(q)
    expect(s).toMatchObject({ q: 'SO-2025', yearFrom: 2015, yearTo: 2020, supplier: ['SUP-A', 'SUP-B'], use: ['office'], sdc: ['D', 'E'], status: 'draft', page: 3, sort: 'yearDesigned', order: 'desc' })
    expect(queryFromListState(s)).toEqual(q)
    expect(queryFromListState(DEFAULT_LIST_STATE)).toEqual({})
  })
  it('drops a value the contract refuses and keeps the rest', () => {
    // sort=secret is not whitelisted; sdc=Z is no SDC; yearTo before yearFrom fails the refinement on yearTo.
    expect(listStateFromQuery({ sort: 'secret', q: 'x' })).toMatchObject({ sort: 'code', q: 'x' })
    expect(listStateFromQuery({ sdc: 'Z', use: 'school' })).toMatchObject({ use: ['school'] })
    expect(listStateFromQuery({ sdc: 'Z' }).sdc).toBeUndefined()
    const s = listStateFromQuery({ yearFrom: '2020', yearTo: '2010' })
    expect(s.yearFrom).toBe(2020)
    expect(s.yearTo).toBeUndefined()
  })
  it('takes the first of repeated parameters', () => {
    expect(listStateFromQuery({ q: ['a', 'b'] }).q).toBe('a')
  })
  it('starts again at page 1 when a filter changes, not when paging or sorting', () => {
    const s = listStateFromQuery({ page: '4' })
    expect(withChange(s, { sdc: ['D'] }).page).toBe(1)
    expect(withChange(s, { sort: 'name' }).page).toBe(4)
    expect(withChange(s, { page: 5 }).page).toBe(5)
  })
  it('counts set filters, a range once', () => {
    expect(activeFilterCount(listStateFromQuery({ yearFrom: '2010', yearTo: '2012', sdc: 'D', status: 'finished', q: 'x' }))).toBe(3)
  })
})
