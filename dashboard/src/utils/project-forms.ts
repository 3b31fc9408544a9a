import { CreateSnapshotBody, PatchProjectBody, type ProjectDetail, type SupplierPhase } from '@shared/schemas/projects'
import { fromDisplay, type UnitSystem } from '@shared/units/systems'
import { fromStoredFeet, fromStoredFt2, toStoredFeet, toStoredFt2 } from './project-format'

/**
 * The two edit forms of a project record, as plain data: the values shown (in the user's unit
 * system), the body sent (stored US units, only what changed for the project edit), and the
 * shared schema's messages keyed by field. Pure, no Vue.
 */

type Issue = { path: PropertyKey[]; message: string }

/** field → first message, from zod issues (the body's top-level field names). */
export function fieldMessages(issues: readonly Issue[]): Record<string, string> {
  const out: Record<string, string> = {}
  for (const i of issues) {
    const k = i.path.length ? String(i.path[0]) : '(body)'
    out[k] ??= i.message
  }
  return out
}

export interface ProjectForm {
  name: string
  client: string
  clientConfidential: boolean
  benchmarkPermitted: boolean
  office: string
  region: string
  buildingUse: PatchProjectBody['buildingUse']
  riskCategory: PatchProjectBody['riskCategory']
  sdc: PatchProjectBody['sdc']
  siteClass: PatchProjectBody['siteClass']
  stories: number | null
  /** ft (US) or m (SI). */
  height: number | null
  /** ft² (US) or m² (SI). */
  floorArea: number | null
  yearDesigned: number | null
  yearCompleted: number | null
  phaseReached: PatchProjectBody['phaseReached']
  supplierCode: string
  draft: boolean
}

const round = (v: number, digits: number) => Number(v.toFixed(digits))

export function projectFormOf(p: ProjectDetail['project'], units: UnitSystem): ProjectForm {
  return {
    name: p.name,
    client: p.client ?? '',
    clientConfidential: p.clientConfidential,
    benchmarkPermitted: p.benchmarkPermitted,
    office: p.office ?? '',
    region: p.region ?? '',
    buildingUse: (p.buildingUse as ProjectForm['buildingUse']) ?? null,
    riskCategory: (p.riskCategory as ProjectForm['riskCategory']) ?? null,
    sdc: (p.sdc as ProjectForm['sdc']) ?? null,
    siteClass: (p.siteClass as ProjectForm['siteClass']) ?? null,
    stories: p.stories,
    height: p.heightFt === null ? null : round(fromStoredFeet(p.heightFt, units), 3),
    floorArea: p.floorAreaFt2 === null ? null : round(fromStoredFt2(p.floorAreaFt2, units), units === 'us' ? 0 : 1),
    yearDesigned: p.yearDesigned,
    yearCompleted: p.yearCompleted,
    phaseReached: (p.phaseReached as ProjectForm['phaseReached']) ?? null,
    supplierCode: p.supplierCode ?? '',
    draft: p.draft,
  }
}

/**
 * The PATCH body: the fields whose value differs from what the form started with, in stored units.
 * Empty text becomes null (clears it); the year designed cannot be cleared (the contract keeps it).
 */
export function patchBodyOf(form: ProjectForm, initial: ProjectForm, units: UnitSystem): Record<string, unknown> {
  const body: Record<string, unknown> = {}
  const text = (v: string) => (v.trim() === '' ? null : v.trim())
  for (const k of Object.keys(form) as (keyof ProjectForm)[]) {
    if (form[k] === initial[k]) continue
    const v = form[k]
    switch (k) {
      case 'name':
        body.name = String(v).trim()
        break
      case 'client':
      case 'office':
      case 'region':
      case 'supplierCode':
        body[k] = text(String(v))
        break
      case 'height':
        body.heightFt = v === null ? null : toStoredFeet(v as number, units)
        break
      case 'floorArea':
        body.floorAreaFt2 = v === null ? null : toStoredFt2(v as number, units)
        break
      case 'yearDesigned':
        body.yearDesigned = v === null ? undefined : v
        break
      default:
        body[k] = v
    }
  }
  return body
}

/** Checks a PATCH body with the shared schema: the messages by field (empty when it passes). */
export function checkPatch(body: Record<string, unknown>): Record<string, string> {
  const r = PatchProjectBody.safeParse(body)
  return r.success ? {} : formKeys(fieldMessages(r.error.issues))
}

export interface SnapshotForm {
  frameLine: string
  level: string
  phase: SupplierPhase
  revision: number | null
  date: string | null
  sourceDocument: string
  /** in² or mm². */
  coreArea: number | null
  /** ksi or MPa. */
  fysc: number | null
  fyscBasis: CreateSnapshotBody['fyscBasis']
  fyscMax: number | null
  ry: number | null
  beta: number | null
  omega: number | null
  factorDriftMultiple: number | null
  stiffnessFactor: number | null
  yieldLengthRatio: number | null
  governing: boolean
}

export function emptySnapshotForm(frameLine = '', level = ''): SnapshotForm {
  return {
    frameLine,
    level,
    phase: 'submittal',
    revision: null,
    date: null,
    sourceDocument: '',
    coreArea: null,
    fysc: null,
    fyscBasis: 'yield_range',
    fyscMax: null,
    ry: null,
    beta: null,
    omega: null,
    factorDriftMultiple: 2,
    stiffnessFactor: null,
    yieldLengthRatio: null,
    governing: true,
  }
}

/**
 * The POST body in stored units (in², ksi). An empty required number is sent as undefined, so the
 * shared schema names it; optional ones as null.
 */
export function snapshotBodyOf(f: SnapshotForm, units: UnitSystem): Record<string, unknown> {
  const conv = (kind: 'area' | 'stress', v: number | null) => (v === null ? undefined : fromDisplay(kind, v, units))
  const opt = (v: number | null) => (v === null ? null : v)
  return {
    frameLine: f.frameLine,
    level: f.level,
    phase: f.phase,
    ...(f.revision === null ? {} : { revision: f.revision }),
    date: f.date || null,
    sourceDocument: f.sourceDocument.trim() || null,
    coreAreaIn2: conv('area', f.coreArea),
    fyscKsi: conv('stress', f.fysc),
    fyscBasis: f.fyscBasis,
    fyscMaxKsi: f.fyscMax === null ? null : fromDisplay('stress', f.fyscMax, units),
    ry: opt(f.ry),
    beta: f.beta ?? undefined,
    omega: f.omega ?? undefined,
    factorDriftMultiple: opt(f.factorDriftMultiple),
    stiffnessFactor: opt(f.stiffnessFactor),
    yieldLengthRatio: opt(f.yieldLengthRatio),
    governing: f.governing,
  }
}

/** Checks a snapshot body with the shared schema: messages by field, keyed by the form's field names. */
export function checkSnapshot(body: Record<string, unknown>): Record<string, string> {
  const r = CreateSnapshotBody.safeParse(body)
  return r.success ? {} : formKeys(fieldMessages(r.error.issues))
}

const BODY_TO_FORM: Record<string, string> = { coreAreaIn2: 'coreArea', fyscKsi: 'fysc', fyscMaxKsi: 'fyscMax', heightFt: 'height', floorAreaFt2: 'floorArea' }

/** Server or schema messages keyed by body field → keyed by form field. */
export function formKeys(messages: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {}
  for (const [k, v] of Object.entries(messages)) out[BODY_TO_FORM[k] ?? k] = v
  return out
}
