import { createRouter, createWebHistory, type RouteRecordRaw } from 'vue-router'
import { AREA_INFO, AREAS, isAreaAllowed, type Area } from '@shared/auth/roles'
import { setUnauthenticatedHandler } from '../api/client'
import { useSessionStore } from '../stores/session'
import { loadingBar, message } from '../utils/discrete'
import { safeRedirect } from '../utils/redirect'

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean
    /** The product area this page belongs to; its roles decide access. */
    area?: Area
    title?: string
  }
}

/** Areas whose screens are built get their own view here; the others show the "not available yet" panel. */
const BUILT: Partial<Record<Area, () => Promise<unknown>>> = {
  admin: () => import('../views/AdminView.vue'),
  'new-frame': () => import('../views/NewFrameView.vue'),
  imports: () => import('../views/ImportsView.vue'),
  projects: () => import('../views/ProjectsView.vue'),
  calibration: () => import('../views/CalibrationView.vue'),
  'starting-factors': () => import('../views/StartingFactorsView.vue'),
  overview: () => import('../views/OverviewView.vue'),
  precedents: () => import('../views/PrecedentsView.vue'),
  benchmarks: () => import('../views/BenchmarksView.vue'),
}

const areaRoutes: RouteRecordRaw[] = AREAS.map(area => ({
  path: AREA_INFO[area].path.slice(1),
  name: area,
  component: BUILT[area] ?? (() => import('../views/AreaPendingView.vue')),
  meta: { area, title: AREA_INFO[area].label },
}))

const routes: RouteRecordRaw[] = [
  { path: '/sign-in', name: 'sign-in', component: () => import('../views/SignInView.vue'), meta: { public: true, title: 'Sign in' } },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('../views/ForgotPasswordView.vue'),
    meta: { public: true, title: 'Forgot password' },
  },
  {
    path: '/set-password',
    name: 'set-password',
    component: () => import('../views/SetPasswordView.vue'),
    meta: { public: true, title: 'Set password' },
  },
  {
    path: '/',
    component: () => import('../layouts/AppLayout.vue'),
    children: [
      { path: '', name: 'home', redirect: () => useSessionStore().homePath },
      ...areaRoutes,
      { path: 'projects/:code', name: 'project', component: BUILT.projects!, meta: { area: 'projects', title: AREA_INFO.projects.label } },
      { path: 'account', name: 'account', component: () => import('../views/AccountView.vue'), meta: { title: 'Account' } },
      { path: 'forbidden', name: 'forbidden', component: () => import('../views/ForbiddenView.vue'), meta: { title: 'Not allowed' } },
      { path: ':pathMatch(.*)*', name: 'not-found', component: () => import('../views/NotFoundView.vue'), meta: { title: 'Not found' } },
    ],
  },
]

export const router = createRouter({ history: createWebHistory(), routes })

router.beforeEach(async to => {
  loadingBar.start()
  const session = useSessionStore()
  await session.check()
  if (to.meta.public) {
    if (to.name === 'sign-in' && session.user) return safeRedirect(to.query.redirect, session.homePath)
    return true
  }
  if (!session.user) return { name: 'sign-in', query: to.fullPath === '/' ? {} : { redirect: to.fullPath } }
  if (to.meta.area && !isAreaAllowed(to.meta.area, session.user.role)) {
    return { name: 'forbidden', query: { from: to.fullPath } }
  }
  return true
})

router.afterEach(to => {
  loadingBar.finish()
  document.title = to.meta.title ? `${to.meta.title} · Backsight` : 'Backsight'
})

router.onError(err => {
  loadingBar.error()
  message.error(err instanceof Error ? err.message : 'The page could not be opened.')
})

// Any API call that finds the session gone sends the user to sign in, and back afterwards.
setUnauthenticatedHandler(() => {
  const session = useSessionStore()
  const current = router.currentRoute.value
  session.forget()
  if (!current.meta.public) {
    message.warning('Your session has ended. Please sign in again.')
    void router.push({ name: 'sign-in', query: { redirect: current.fullPath } })
  }
})
