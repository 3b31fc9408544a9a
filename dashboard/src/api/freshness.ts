import { readonly, shallowRef } from 'vue'
import { DATA_STALE_HEADER } from '@shared/schemas/freshness'

/*
 * Right after a data change (an import, an edit, a review resolution), the server may answer from
 * the data version just before while it builds the new one, and says so in a response header. The
 * dashboard shows that its figures are catching up, and a moment later bumps `epoch`: the screens
 * that show history figures watch it and ask again, which brings the new version's answers (or
 * another round of catching up).
 */

/** How long after a stale answer the screens ask again. */
export const CATCH_UP_DELAY_MS = 1500

const catchingUp = shallowRef(false)
const epoch = shallowRef(0)
let timer: ReturnType<typeof setTimeout> | undefined

/** Notes whether `res` is an answer from an older data version (called on every API response). */
export function noteFreshness(res: Pick<Response, 'headers'>): void {
  if (!res.headers.get(DATA_STALE_HEADER)) return
  catchingUp.value = true
  timer ??= setTimeout(() => {
    timer = undefined
    catchingUp.value = false
    epoch.value++
  }, CATCH_UP_DELAY_MS)
}

/** `catchingUp`: some figures on screen are from just before a data change; `epoch`: ask again when it changes. */
export const dataFreshness = { catchingUp: readonly(catchingUp), epoch: readonly(epoch) }
