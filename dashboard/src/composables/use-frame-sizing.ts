import { computed, onScopeDispose, shallowRef, watch, type Ref } from 'vue'
import { EngineeringInputError, type InputIssue } from '@shared/engineering/errors'
import { sizeFrame } from '@shared/engineering/size-frame'
import type { SizeFrameRequest } from '@shared/engineering/size-frame-input'
import type { SizeFrameResult } from '@shared/engineering/size-frame-result'
import { toFieldMessageMap } from '../utils/field-messages'
import { isFrameEmpty, toSizingRequest, type WorksheetForm } from '../utils/worksheet-form'

/**
 * Instant results: runs the shared engine in the browser a moment after the worksheet changes.
 * Invalid input comes back as field errors (no result); unusual input as warnings beside the inputs.
 */
export function useFrameSizing(form: Ref<WorksheetForm>, delayMs = 120) {
  const result = shallowRef<SizeFrameResult>()
  const request = shallowRef<SizeFrameRequest>()
  const errors = shallowRef<readonly InputIssue[]>([])
  const empty = computed(() => isFrameEmpty(form.value))

  function compute() {
    const next = toSizingRequest(form.value)
    try {
      result.value = sizeFrame(next)
      request.value = next
      errors.value = []
    } catch (e) {
      result.value = undefined
      request.value = undefined
      errors.value = e instanceof EngineeringInputError ? e.issues : [{ field: '', message: e instanceof Error ? e.message : String(e) }]
    }
  }

  let timer: ReturnType<typeof setTimeout> | undefined
  watch(
    form,
    () => {
      clearTimeout(timer)
      timer = setTimeout(compute, delayMs)
    },
    { deep: true },
  )
  compute()
  onScopeDispose(() => clearTimeout(timer))

  const warnings = computed(() => result.value?.warnings ?? [])
  /** Nothing is flagged while the frame is still blank. */
  const messages = computed(() => (empty.value ? {} : toFieldMessageMap(errors.value, warnings.value)))
  return { result, request, errors, warnings, messages, empty, compute }
}
