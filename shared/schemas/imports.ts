import { z } from 'zod'

export const RunId = z.coerce.number().int().positive()

export const ImportRun = z.object({
  id: z.number().int(),
  source: z.string(),
  fileName: z.string(),
  sha256: z.string(),
  status: z.enum(['queued', 'running', 'finished', 'failed']),
  progressStage: z.string().nullable(),
  progressDone: z.number().int(),
  progressTotal: z.number().int(),
  loaded: z.number().int(),
  updated: z.number().int(),
  unchanged: z.number().int(),
  rejected: z.number().int(),
  queued: z.number().int(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  userName: z.string().nullable(),
  error: z.string().nullable(),
  hasOriginal: z.boolean(),
})
export type ImportRun = z.infer<typeof ImportRun>

export const ImportProblemRow = z.object({
  id: z.number().int(),
  severity: z.enum(['error', 'review', 'note']),
  projectCode: z.string().nullable(),
  file: z.string(),
  sheet: z.string().nullable(),
  row: z.number().int().nullable(),
  column: z.string().nullable(),
  value: z.string().nullable(),
  message: z.string(),
})
export type ImportProblemRow = z.infer<typeof ImportProblemRow>

export const ImportRunList = z.object({ items: z.array(ImportRun) })
export const ImportRunDetail = z.object({ run: ImportRun, problems: z.array(ImportProblemRow) })
export type ImportRunDetail = z.infer<typeof ImportRunDetail>

export const ReviewItemId = z.coerce.number().int().positive()

export const ReviewItem = z.object({
  id: z.number().int(),
  runId: z.number().int().nullable(),
  projectCode: z.string(),
  field: z.string(),
  value: z.string().nullable(),
  reason: z.string(),
  status: z.enum(['open', 'confirmed', 'corrected', 'discarded']),
  /** Where the value sits, for a brace value. */
  location: z.object({ frameLine: z.string(), level: z.string(), phase: z.string(), revision: z.number().int() }).nullable(),
})
export type ReviewItem = z.infer<typeof ReviewItem>

export const ReviewItemList = z.object({ items: z.array(ReviewItem) })

export const ReviewListQuery = z.object({ status: z.enum(['open', 'confirmed', 'corrected', 'discarded', 'all']).default('open') })

export const ResolveReviewBody = z.discriminatedUnion('action', [
  z.object({ action: z.literal('confirm') }),
  z.object({ action: z.literal('discard') }),
  z.object({ action: z.literal('correct'), value: z.number().finite().positive({ message: 'Enter the corrected value (a positive number in the stored unit).' }) }),
])
export type ResolveReviewBody = z.infer<typeof ResolveReviewBody>

export const DataQuality = z.object({
  projects: z.number().int(),
  awaitingReview: z.number().int(),
  withoutFinals: z.array(z.object({ code: z.string(), name: z.string(), phaseReached: z.string().nullable() })),
  completeness: z.array(z.object({ code: z.string(), name: z.string(), braces: z.number().int(), withFinal: z.number().int(), share: z.number() })),
})
export type DataQuality = z.infer<typeof DataQuality>

export const ExportQuery = z.object({ format: z.enum(['xlsx', 'json', 'csv', 'arrow']).default('xlsx') })

/** `POST /api/projects/drafts`: today's New frame worksheet as a draft project of the history. */
export const CreateDraftBody = z.object({
  name: z.string().trim().min(1, { message: 'Name the project.' }).max(200),
  /** The worksheet's sizing request (validated again as `SizingRequest`). */
  request: z.unknown(),
})
export type CreateDraftBody = z.infer<typeof CreateDraftBody>

export const DraftCreated = z.object({ projectId: z.number().int(), code: z.string() })
export type DraftCreated = z.infer<typeof DraftCreated>
