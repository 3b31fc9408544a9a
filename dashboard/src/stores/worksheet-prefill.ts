import { defineStore } from 'pinia'
import { shallowRef } from 'vue'
import type { WorksheetPrefill } from '../utils/worksheet-prefill'

/**
 * A hand-off to the New frame worksheet from another screen: one pending update and its source
 * label. The sender `offer`s it and opens the worksheet; the worksheet `take`s it once when it
 * opens (taking clears it, so a later visit does not apply it again).
 */
export const useWorksheetPrefillStore = defineStore('worksheet-prefill', () => {
  const pending = shallowRef<WorksheetPrefill>()

  function offer(prefill: WorksheetPrefill) {
    pending.value = prefill
  }

  function take(): WorksheetPrefill | undefined {
    const p = pending.value
    pending.value = undefined
    return p
  }

  function clear() {
    pending.value = undefined
  }

  return { pending, offer, take, clear }
})
