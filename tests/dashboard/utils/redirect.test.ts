import { describe, expect, it } from 'vitest'
import { safeRedirect } from '../../../dashboard/src/utils/redirect'

describe('safeRedirect(raw, fallback)', () => {
  it.each([
    ['/projects?page=2', '/projects?page=2'],
    ['/calibration#scatter', '/calibration#scatter'],
  ])('keeps the local path %s', (raw, expected) => {
    expect(safeRedirect(raw, '/home')).toBe(expected)
  })

  it.each([
    ['//evil.example/x'],
    ['/\\evil.example'],
    ['https://evil.example/'],
    ['javascript:alert(1)'],
    ['/sign-in?redirect=/x'],
    ['/ok\nSet-Cookie: x'],
    [undefined],
    [['/a', '/b']],
  ])('falls back for %j (open redirect)', raw => {
    expect(safeRedirect(raw, '/home')).toBe('/home')
  })
})
