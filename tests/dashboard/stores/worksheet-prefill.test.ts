import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import { FALLBACK_SIZING_DEFAULTS } from '@shared/schemas/settings'
import { useWorksheetPrefillStore } from '../../../dashboard/src/stores/worksheet-prefill'
import { createWorksheetForm } from '../../../dashboard/src/utils/worksheet-form'
import { applyWorksheetPrefill, type WorksheetPrefill } from '../../../dashboard/src/utils/worksheet-prefill'

const prefill: WorksheetPrefill = { what: 'Starting factors', source: 'test', units: 'us', basis: { beta: 1.12, omega: 1.35, stiffnessFactor: 1.4, fyscMax: 46 } }

describe('the worksheet prefill store', () => {
  beforeEach(() => setActivePinia(createPinia()))

  it('hands an offered update over once: taking it clears it', () => {
    const store = useWorksheetPrefillStore()
    expect(store.take()).toBeUndefined()
    store.offer(prefill)
    expect(store.pending).toEqual(prefill)
    expect(store.take()).toEqual(prefill)
    expect(store.take()).toBeUndefined()
  })

  it('keeps only the latest offer, and can be cleared', () => {
    const store = useWorksheetPrefillStore()
    store.offer(prefill)
    store.offer({ ...prefill, source: 'second' })
    expect(store.pending?.source).toBe('second')
    store.clear()
    expect(store.take()).toBeUndefined()
  })
})

describe('applyWorksheetPrefill', () => {
  it('changes only the fields it carries and switches to the yield-range basis for a Fysc,max', () => {
    const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'us')
    form.bayWidth = 28
    const next = applyWorksheetPrefill(form, prefill)
    expect(next.basis.beta).toBe(1.12)
    expect(next.basis.omega).toBe(1.35)
    expect(next.basis.stiffnessFactor).toBe(1.4)
    expect(next.basis.fyscMax).toBe(46)
    expect(next.basis.basisKind).toBe('yieldRange')
    expect(next.bayWidth).toBe(28)
    expect(next.basis.fyscMin).toBe(form.basis.fyscMin)
    expect(next.levels).toBe(form.levels)
    // The original form is not changed.
    expect(form.basis.beta).toBe(FALLBACK_SIZING_DEFAULTS.beta)
  })

  it('converts stresses into the worksheet’s units; factors stay as they are', () => {
    const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'si')
    const next = applyWorksheetPrefill(form, prefill)
    // 1 ksi = 6.894757 MPa (NIST SP 811, B.9): 46 ksi = 317.1588 MPa
    expect(next.basis.fyscMax).toBeCloseTo(317.1588, 3)
    expect(next.basis.beta).toBe(1.12)
  })

  it('can carry the frame and its stories too (a precedent’s geometry), converted', () => {
    const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'si')
    const next = applyWorksheetPrefill(form, {
      what: 'Geometry',
      source: 'precedent P-1',
      units: 'us',
      configuration: 'v',
      bayWidth: 30,
      levels: [
        { name: 'L1', storyHeight: 15, storyShear: 100 },
        { name: 'L2', storyHeight: 13, storyShear: 60 },
      ],
    })
    expect(next.configuration).toBe('v')
    // 30 ft × 0.3048 = 9.144 m; 15 ft = 4.572 m (exact, NIST SP 811); 100 kip × 4.448222 = 444.8222 kN
    expect(next.bayWidth).toBeCloseTo(9.144, 9)
    expect(next.levels.map(l => l.storyHeight)).toEqual([4.572, 3.9624])
    expect(next.levels[0]!.storyShear).toBeCloseTo(444.8222, 3)
    expect(new Set(next.levels.map(l => l.id)).size).toBe(2)
    expect(next.basis).toEqual(form.basis)
  })
})
