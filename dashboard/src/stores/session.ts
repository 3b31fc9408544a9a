import { defineStore } from 'pinia'
import { computed, shallowRef } from 'vue'
import { areasFor, homePathFor, type Area } from '@shared/auth/roles'
import type { SignInBody, UnitSystem, User } from '@shared/schemas/auth'
import * as authApi from '../api/auth'
import { ApiError } from '../api/client'

/** The signed-in user, shared by the router, the layout and every screen. */
export const useSessionStore = defineStore('session', () => {
  const user = shallowRef<User>()
  /** True once we asked the server who is signed in (so the router can decide). */
  const checked = shallowRef(false)

  const areas = computed<Area[]>(() => (user.value ? areasFor(user.value.role) : []))
  const homePath = computed(() => (user.value ? homePathFor(user.value.role) : '/sign-in'))
  const units = computed<UnitSystem>(() => user.value?.units ?? 'us')

  /** Asks the server once per page load; a 401 simply means nobody is signed in. */
  async function check() {
    if (checked.value) return
    try {
      user.value = await authApi.getMe()
    } catch (e) {
      if (!(e instanceof ApiError && e.status === 401)) throw e
      user.value = undefined
    } finally {
      checked.value = true
    }
  }

  async function signIn(body: SignInBody) {
    user.value = await authApi.signIn(body)
    checked.value = true
  }

  async function signOut() {
    try {
      await authApi.signOut()
    } finally {
      forget()
    }
  }

  /** Drop the local copy (after a 401, or sign-out). */
  function forget() {
    user.value = undefined
    checked.value = true
  }

  async function setUnits(next: UnitSystem) {
    user.value = await authApi.updatePreferences({ units: next })
  }

  async function setName(name: string) {
    user.value = await authApi.updatePreferences({ name })
  }

  return { user, checked, areas, homePath, units, check, signIn, signOut, forget, setUnits, setName }
})
