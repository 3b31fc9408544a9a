/**
 * What the history loader produces from a file and stores: one record per project, in the stored
 * units (in, kip, ksi, in², ft², short tons), plus the problems it found.
 */

export type Severity = 'error' | 'review' | 'note'

/** One problem, located as precisely as the file allows. `error` rejects the project; `review` queues a value. */
export interface ImportProblem {
  severity: Severity
  projectCode?: string
  file: string
  sheet?: string
  row?: number
  column?: string
  value?: string
  message: string
}

export interface SnapshotRecord {
  phase: 'sd' | 'dd' | 'cd' | 'submittal' | 'approved' | 'coupon'
  revision: number
  date: string | null
  sourceDocument: string | null
  requiredCoreAreaIn2: number | null
  coreAreaIn2: number | null
  fyscKsi: number | null
  fyscBasis: 'specified_min' | 'yield_range' | 'mill_cert' | 'coupon' | null
  fyscMaxKsi: number | null
  ry: number | null
  beta: number | null
  omega: number | null
  factorDriftMultiple: number | null
  stiffnessFactor: number | null
  yieldLengthRatio: number | null
  adjustedTensionKip: number | null
  adjustedCompressionKip: number | null
  governing: boolean
  /** False while one of its values waits in the review queue. */
  confirmed: boolean
}

export interface BraceRecord {
  braceCount: number
  angleDeg: number
  workPointLengthIn: number
  requiredStrengthKip: number
  method: 'lrfd' | 'asd'
  snapshots: SnapshotRecord[]
}

export interface LevelRecord {
  name: string
  levelIndex: number
  storyHeightIn: number
  storyShearKip: number
  designDriftIn: number | null
  brace: BraceRecord | null
}

export interface FrameRecord {
  frameLine: string
  configuration: 'single_diagonal' | 'inverted_v' | 'v' | 'two_story_x'
  bays: number
  bayWidthIn: number
  levels: LevelRecord[]
}

export interface TonnageRecord {
  stage: 'preliminary' | 'final'
  category: 'braces' | 'beams' | 'columns' | 'connections' | 'lateral_total' | 'structural_total'
  tons: number
  scope: string | null
}

export interface ProjectFields {
  code: string
  name: string
  client: string | null
  clientConfidential: boolean
  benchmarkPermitted: boolean
  office: string | null
  region: string | null
  buildingUse: string | null
  riskCategory: string | null
  importanceFactor: number | null
  sdc: string | null
  sds: number | null
  sd1: number | null
  siteClass: string | null
  stories: number | null
  heightFt: number | null
  floorAreaFt2: number | null
  asce7Edition: string | null
  aisc341Edition: string | null
  analysisMethod: string | null
  r: number | null
  cd: number | null
  omega0: number | null
  supplierCode: string | null
  yearDesigned: number
  yearCompleted: number | null
  phaseReached: string | null
}

/** A value the loader will not load silently: it waits for an engineer or principal. */
export interface ReviewRecord {
  field: string
  value: string
  reason: string
  /** The snapshot the value belongs to, when it is a brace value. */
  snapshot?: { frameLine: string; level: string; phase: SnapshotRecord['phase']; revision: number }
  /** Where the value stands in the file. */
  at?: { file: string; sheet?: string; row?: number }
}

export interface ProjectRecord {
  fields: ProjectFields
  frames: FrameRecord[]
  tonnage: TonnageRecord[]
  reviews: ReviewRecord[]
  /** Where the project's row came from, for messages. */
  source: { file: string; sheet?: string; row: number }
}

export interface SupplierRecord {
  code: string
  displayName: string
  notes: string | null
}
