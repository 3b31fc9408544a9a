import { computed, onMounted, shallowRef, watch } from 'vue'
import { dataFreshness } from '../api/freshness'
import { useRoute, useRouter } from 'vue-router'
import type {
  CalibrationCost,
  CalibrationFilters,
  CalibrationGrouping,
  CalibrationOptions,
  CalibrationPoints,
  CalibrationQuantity,
  CalibrationSummary,
  CalibrationTrend,
} from '@shared/schemas/calibration'
import {
  getCalibrationCost,
  getCalibrationMisses,
  getCalibrationOptions,
  getCalibrationPoints,
  getCalibrationSummary,
  getCalibrationTrend,
  type MissesParams,
} from '../api/calibration'
import { ApiError } from '../api/client'
import { viewStateFromQuery, viewStateToQuery, type CalibrationViewState } from '../utils/calibration-query'

type Misses = Awaited<ReturnType<typeof getCalibrationMisses>>

/** One endpoint's answer on the screen: its data, whether it is loading, and the error to show. */
export interface Loaded<T> {
  data: T | undefined
  loading: boolean
  error: string | undefined
}
const idle = <T>(): Loaded<T> => ({ data: undefined, loading: false, error: undefined })
const errorText = (e: unknown, what: string) => (e instanceof ApiError ? e.message : `The ${what} could not be loaded.`)

/**
 * The Calibration review's state: filters, quantity and grouping live in the URL query (so a view
 * can be bookmarked and sent), and every chart reloads from the API when they change. Answers of
 * superseded requests are dropped, so a slow old answer never overwrites a newer one.
 */
export function useCalibrationReview() {
  const route = useRoute()
  const router = useRouter()
  const state = computed<CalibrationViewState>(() => viewStateFromQuery(route.query))

  function update(patch: Partial<CalibrationViewState>) {
    const next = { ...state.value, ...patch }
    void router.replace({ query: viewStateToQuery(next) })
  }
  const setFilters = (filters: CalibrationFilters) => update({ filters })
  const setQuantity = (quantity: CalibrationQuantity) => update({ quantity })
  const setGroupBy = (groupBy: CalibrationGrouping) => update({ groupBy })

  const options = shallowRef<Loaded<CalibrationOptions>>({ ...idle(), loading: true })
  const summary = shallowRef<Loaded<CalibrationSummary>>(idle())
  const points = shallowRef<Loaded<CalibrationPoints>>(idle())
  const trend = shallowRef<Loaded<CalibrationTrend>>(idle())
  const cost = shallowRef<Loaded<CalibrationCost>>(idle())
  const misses = shallowRef<Loaded<Misses>>(idle())
  const missesParams = shallowRef<MissesParams>({ sort: 'ratio', dir: 'asc', limit: 100 })

  let generation = 0
  /** Runs one request into its slot unless a newer load has started since. */
  async function into<T>(slot: { value: Loaded<T> }, what: string, run: () => Promise<T>, gen: number) {
    slot.value = { data: slot.value.data, loading: true, error: undefined }
    try {
      const data = await run()
      if (gen === generation) slot.value = { data, loading: false, error: undefined }
    } catch (e) {
      if (gen === generation) slot.value = { data: undefined, loading: false, error: errorText(e, what) }
    }
  }

  async function loadOptions() {
    options.value = { data: options.value.data, loading: true, error: undefined }
    try {
      options.value = { data: await getCalibrationOptions(), loading: false, error: undefined }
    } catch (e) {
      options.value = { data: undefined, loading: false, error: errorText(e, 'filter options') }
    }
  }

  const hasHistory = computed(() => (options.value.data?.pairs ?? 0) > 0)

  function loadCharts() {
    if (!hasHistory.value) return
    const gen = ++generation
    const { filters, quantity, groupBy } = state.value
    void into(summary, 'distribution', () => getCalibrationSummary(quantity, groupBy, filters), gen)
    void into(points, 'braces', () => getCalibrationPoints(quantity, groupBy, filters), gen)
    void into(trend, 'trend', () => getCalibrationTrend(quantity, filters), gen)
    void into(cost, 'cost of conservatism', () => getCalibrationCost(filters), gen)
    void into(misses, 'largest misses', () => getCalibrationMisses(quantity, missesParams.value, filters), gen)
  }

  let missGen = 0
  async function loadMisses() {
    const gen = ++missGen
    const { filters, quantity } = state.value
    misses.value = { data: misses.value.data, loading: true, error: undefined }
    try {
      const data = await getCalibrationMisses(quantity, missesParams.value, filters)
      if (gen === missGen) misses.value = { data, loading: false, error: undefined }
    } catch (e) {
      if (gen === missGen) misses.value = { data: undefined, loading: false, error: errorText(e, 'largest misses') }
    }
  }
  function setMissesSort(sort: MissesParams['sort'], dir: MissesParams['dir']) {
    missesParams.value = { ...missesParams.value, sort, dir }
    void loadMisses()
  }

  watch(() => JSON.stringify(state.value), loadCharts)
  // Figures from just before a data change: ask again (see api/freshness.ts).
  watch(dataFreshness.epoch, async () => {
    await loadOptions()
    loadCharts()
  })
  onMounted(async () => {
    await loadOptions()
    loadCharts()
  })

  return { state, setFilters, setQuantity, setGroupBy, options, hasHistory, summary, points, trend, cost, misses, missesParams, setMissesSort, reload: loadCharts, loadOptions }
}
