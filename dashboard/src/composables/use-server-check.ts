import { computed, shallowRef, type Ref } from 'vue'
import type { SizeFrameRequest } from '@shared/engineering/size-frame-input'
import type { SizeFrameResult } from '@shared/engineering/size-frame-result'
import type { SizingResponse } from '@shared/schemas/sizing'
import { ApiError } from '../api/client'
import { sizeFrameOnServer } from '../api/sizing'
import { compareResults, type ResultDifference } from '../utils/sizing-results'

export type ServerCheckStatus = 'idle' | 'checking' | 'matches' | 'differs' | 'failed'

/** "Check on server": posts the worksheet's request and compares the authoritative answer with the browser's. */
export function useServerCheck(request: Ref<SizeFrameRequest | undefined>, local: Ref<SizeFrameResult | undefined>) {
  const status = shallowRef<ServerCheckStatus>('idle')
  const differences = shallowRef<ResultDifference[]>([])
  const server = shallowRef<SizingResponse>()
  const error = shallowRef<string>()
  const fields = shallowRef<Record<string, string>>({})
  const checkedRequest = shallowRef<string>()

  async function run() {
    const req = request.value
    const loc = local.value
    if (!req || !loc || status.value === 'checking') return
    status.value = 'checking'
    error.value = undefined
    fields.value = {}
    const key = JSON.stringify(req)
    try {
      const answer = await sizeFrameOnServer({ ...req, coreSteps: req.coreSteps ?? undefined })
      server.value = answer
      differences.value = compareResults(loc, answer)
      status.value = differences.value.length === 0 ? 'matches' : 'differs'
    } catch (e) {
      status.value = 'failed'
      error.value = e instanceof ApiError ? e.message : 'The server check failed.'
      fields.value = e instanceof ApiError ? e.fields : {}
    } finally {
      checkedRequest.value = key
    }
  }

  /** The inputs changed since the last check, so its verdict no longer applies. */
  const stale = computed(() => checkedRequest.value !== undefined && checkedRequest.value !== JSON.stringify(request.value))
  return { status, differences, server, error, fields, stale, run }
}
