import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { z } from 'zod'
import { DATA_STALE_HEADER } from '@shared/schemas/freshness'
import { request } from '../../../dashboard/src/api/client'
import { CATCH_UP_DELAY_MS, dataFreshness } from '../../../dashboard/src/api/freshness'

// An answer from the data version before the newest (the server's header) shows the dashboard's
// "catching up" notice, and a moment later asks the screens to load again, once per round.

const answer = (stale: boolean) =>
  new Response(JSON.stringify({ n: 1 }), { status: 200, headers: { 'content-type': 'application/json', ...(stale ? { [DATA_STALE_HEADER]: 'version=4; newest=5' } : {}) } })

describe('dataFreshness', () => {
  beforeEach(() => {
    vi.useFakeTimers()
  })
  afterEach(() => {
    vi.useRealTimers()
    vi.unstubAllGlobals()
  })

  it('catches up after a stale answer: notice on, then one reload and notice off', async () => {
    const fetch = vi.fn(async () => answer(false))
    vi.stubGlobal('fetch', fetch)
    const epoch0 = dataFreshness.epoch.value
    await request('/api/calibration/options', { response: z.object({ n: z.number() }) })
    expect(dataFreshness.catchingUp.value).toBe(false)

    fetch.mockImplementation(async () => answer(true))
    // Two stale answers in one round (two panels of one screen) ask for one reload, not two.
    await request('/api/calibration/summary', { response: z.object({ n: z.number() }) })
    await request('/api/calibration/trend', { response: z.object({ n: z.number() }) })
    expect(dataFreshness.catchingUp.value).toBe(true)
    vi.advanceTimersByTime(CATCH_UP_DELAY_MS - 1)
    expect(dataFreshness.epoch.value).toBe(epoch0)
    vi.advanceTimersByTime(1)
    expect(dataFreshness.epoch.value).toBe(epoch0 + 1)
    expect(dataFreshness.catchingUp.value).toBe(false)

    // The reload answers from the newest version: nothing more happens.
    fetch.mockImplementation(async () => answer(false))
    await request('/api/calibration/summary', { response: z.object({ n: z.number() }) })
    vi.advanceTimersByTime(10 * CATCH_UP_DELAY_MS)
    expect(dataFreshness.epoch.value).toBe(epoch0 + 1)
    expect(dataFreshness.catchingUp.value).toBe(false)
  })
})
