/**
 * Roles and the product areas each may use. One table, read by the API (route guards)
 * and by the dashboard (navigation), so the two cannot drift apart.
 */
export const ROLES = ['admin', 'principal', 'engineer', 'bd'] as const
export type Role = (typeof ROLES)[number]

/** Human names for roles, as shown in the admin screens. */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  principal: 'Principal',
  engineer: 'Engineer',
  bd: 'Business development',
}

/** What each role is for, shown beside the role picker. */
export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  admin: 'Users, roles and firm settings.',
  principal: 'Everything analytic, including steel cost and calibration.',
  engineer: 'History, precedents, sizing and imports.',
  bd: 'Tonnage benchmarks for proposals; no client names or project records.',
}

export const AREAS = [
  'overview',
  'calibration',
  'starting-factors',
  'precedents',
  'projects',
  'benchmarks',
  'new-frame',
  'imports',
  'admin',
] as const
export type Area = (typeof AREAS)[number]

export interface AreaInfo {
  /** Navigation label. */
  label: string
  /** Path in the dashboard. */
  path: string
  /** Roles that see this area in navigation and may call its API. */
  roles: readonly Role[]
  /** One line shown on the area's page. */
  summary: string
}

const analysts = ['principal', 'engineer'] as const

export const AREA_INFO: Record<Area, AreaInfo> = {
  overview: { label: 'Overview', path: '/overview', roles: ['principal', 'engineer', 'bd'], summary: 'The firm’s BRB history at a glance.' },
  calibration: {
    label: 'Calibration review',
    path: '/calibration',
    roles: analysts,
    summary: 'How early brace factor assumptions compared with the supplier’s final values, and what it cost.',
  },
  'starting-factors': {
    label: 'Starting factors',
    path: '/starting-factors',
    roles: analysts,
    summary: 'Evidence-based starting values for β, ω, overstrength and stiffness from comparable past braces.',
  },
  precedents: {
    label: 'Precedents',
    path: '/precedents',
    roles: analysts,
    summary: 'Past frames most like the one you are starting, and how they turned out.',
  },
  projects: {
    label: 'Project records',
    path: '/projects',
    roles: analysts,
    summary: 'Finished and draft projects: frames, levels, braces, submittals and tonnage.',
  },
  benchmarks: {
    label: 'Benchmarks',
    path: '/benchmarks',
    roles: ['principal', 'bd'],
    summary: 'Steel tonnage benchmarks for fee proposals, with no client names.',
  },
  'new-frame': {
    label: 'New frame',
    path: '/new-frame',
    roles: analysts,
    summary: 'Preliminary BRB core sizing and capacity-design forces for a whole frame.',
  },
  imports: {
    label: 'Imports',
    path: '/imports',
    roles: ['principal', 'engineer', 'admin'],
    summary: 'Load project history from workbooks and CSV files; review what the loader flagged.',
  },
  admin: { label: 'Admin', path: '/admin', roles: ['admin'], summary: 'Users, roles, firm settings and the demo mailbox.' },
}

/** True when `role` may use `area`. */
export function isAreaAllowed(area: Area, role: Role): boolean {
  return AREA_INFO[area].roles.includes(role)
}

/** The areas a role sees, in navigation order. */
export function areasFor(role: Role): Area[] {
  return AREAS.filter(a => isAreaAllowed(a, role))
}

/** The area each role lands on after sign-in. */
export const HOME_AREA: Record<Role, Area> = {
  admin: 'admin',
  principal: 'overview',
  engineer: 'overview',
  bd: 'overview',
}

/** Where a role lands after sign-in. */
export function homePathFor(role: Role): string {
  return AREA_INFO[HOME_AREA[role]].path
}
