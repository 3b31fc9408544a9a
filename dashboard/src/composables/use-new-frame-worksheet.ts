import { nextTick, onBeforeUnmount, onMounted, ref, shallowRef, watch } from 'vue'
import { FALLBACK_SIZING_DEFAULTS, type SizingDefaults } from '@shared/schemas/settings'
import { ApiError } from '../api/client'
import { getSizingDefaults, getWorksheet, saveWorksheet } from '../api/sizing'
import { useSessionStore } from '../stores/session'
import { useWorksheetPrefillStore } from '../stores/worksheet-prefill'
import { message } from '../utils/discrete'
import { applyWorksheetPrefill } from '../utils/worksheet-prefill'
import { basisFromDefaults, convertWorksheetForm, createWorksheetForm, maybeWorksheetForm, type WorksheetForm } from '../utils/worksheet-form'

export type SaveStatus = 'idle' | 'pending' | 'saving' | 'saved' | 'failed'

/**
 * The New frame worksheet's state: starts from the firm's defaults (in the user's units),
 * comes back from the server on load, is saved there about a second after each change,
 * and follows the user's unit preference (the physical frame stays the same).
 */
export function useNewFrameWorksheet(saveDelayMs = 1000) {
  const session = useSessionStore()
  const form = ref<WorksheetForm>(createWorksheetForm(FALLBACK_SIZING_DEFAULTS, session.units))
  const firmDefaults = shallowRef<SizingDefaults>(FALLBACK_SIZING_DEFAULTS)
  const loading = shallowRef(true)
  const saveStatus = shallowRef<SaveStatus>('idle')
  const savedAt = shallowRef<string | null>(null)
  /** An update handed over by another screen (e.g. the starting factors) and applied on open: what it was and from where. */
  const prefilledFrom = shallowRef<{ what: string; source: string }>()
  const prefill = useWorksheetPrefillStore()
  let ready = false
  let timer: ReturnType<typeof setTimeout> | undefined
  let saving: Promise<void> | undefined
  let again = false

  async function loadDefaults(): Promise<SizingDefaults> {
    try {
      firmDefaults.value = await getSizingDefaults()
    } catch (e) {
      message.warning(e instanceof ApiError ? `Firm defaults could not be loaded (${e.message}); built-in defaults are used.` : 'Firm defaults could not be loaded.')
    }
    return firmDefaults.value
  }

  async function load() {
    loading.value = true
    const [defaults, saved] = await Promise.all([
      loadDefaults(),
      getWorksheet('new-frame').catch((e: unknown) => {
        message.warning(e instanceof ApiError ? `Your saved worksheet could not be loaded: ${e.message}` : 'Your saved worksheet could not be loaded.')
        return undefined
      }),
    ])
    const restored = maybeWorksheetForm(saved?.state)
    form.value = restored ? convertWorksheetForm(restored, session.units) : createWorksheetForm(defaults, session.units)
    savedAt.value = saved?.updatedAt ?? null
    saveStatus.value = restored ? 'saved' : 'idle'
    loading.value = false
    await nextTick() // the deep watcher below has seen the loaded form by now: it is not a change to save
    ready = true
    // Applied once, after loading, so it counts as a change and is saved like one typed by hand.
    const offered = prefill.take()
    if (offered) {
      form.value = applyWorksheetPrefill(form.value, offered)
      prefilledFrom.value = { what: offered.what, source: offered.source }
    }
  }

  async function save() {
    if (saving) {
      again = true
      return saving
    }
    saveStatus.value = 'saving'
    saving = (async () => {
      try {
        const r = await saveWorksheet('new-frame', form.value as unknown as Record<string, unknown>)
        savedAt.value = r.updatedAt
        saveStatus.value = 'saved'
      } catch (e) {
        saveStatus.value = 'failed'
        message.error(e instanceof ApiError ? `The worksheet was not saved: ${e.message}` : 'The worksheet was not saved.')
      } finally {
        saving = undefined
      }
    })()
    await saving
    if (again) {
      again = false
      await save()
    }
  }

  watch(
    form,
    () => {
      if (!ready) return
      saveStatus.value = 'pending'
      clearTimeout(timer)
      timer = setTimeout(() => void save(), saveDelayMs)
    },
    { deep: true },
  )

  watch(
    () => session.units,
    units => {
      form.value = convertWorksheetForm(form.value, units)
    },
  )

  /** Put the sizing basis back to the firm's current defaults; the frame and its levels stay. */
  async function resetToFirmDefaults() {
    const defaults = await loadDefaults()
    form.value = { ...form.value, basis: basisFromDefaults(defaults, form.value.units) }
  }

  onMounted(load)
  onBeforeUnmount(() => {
    // Leaving the screen within the save delay still keeps the last change.
    if (saveStatus.value === 'pending') {
      clearTimeout(timer)
      void save()
    }
  })

  return { form, firmDefaults, loading, saveStatus, savedAt, prefilledFrom, resetToFirmDefaults, save }
}
