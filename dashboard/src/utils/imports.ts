import { TABLES } from '@shared/history/columns'
import type { ImportProblemRow, ImportRun, ReviewItem } from '@shared/schemas/imports'
import { STORED_UNITS } from '@shared/units/tokens'

type Severity = ImportProblemRow['severity']

/** What each problem severity means for the data, in plain words. */
export const SEVERITY_INFO: Record<Severity, { label: string; tag: 'error' | 'warning' | 'info'; meaning: string }> = {
  error: { label: 'Error', tag: 'error', meaning: 'the project was not loaded. Fix the file and upload it again.' },
  review: { label: 'Review', tag: 'warning', meaning: 'the project was loaded, but this value waits in the review queue and is not used in analytics until someone confirms or corrects it.' },
  note: { label: 'Note', tag: 'info', meaning: 'information only; nothing was held back.' },
}

export const RUN_STATUS_INFO: Record<ImportRun['status'], { label: string; tag: 'default' | 'info' | 'success' | 'error' }> = {
  queued: { label: 'Queued', tag: 'default' },
  running: { label: 'Running', tag: 'info' },
  finished: { label: 'Finished', tag: 'success' },
  failed: { label: 'Failed', tag: 'error' },
}

/** The loader's progress as a sentence: "Loading projects: 2 of 3". */
export function stageText(run: ImportRun): string {
  if (run.status === 'queued') return 'Waiting for the loader to start…'
  const stage = run.progressStage === 'read' ? 'Reading the file' : run.progressStage === 'load' ? 'Loading projects' : 'Starting'
  return run.progressTotal > 0 ? `${stage}: ${run.progressDone} of ${run.progressTotal}` : `${stage}…`
}

export function formatWhen(iso: string | null): string {
  return iso ? new Date(iso).toLocaleString([], { dateStyle: 'medium', timeStyle: 'short' }) : '—'
}

const UNIT_LABELS: Record<string, string> = { in2: 'in²', ft2: 'ft²' }

/** The unit a queued field is stored in (ksi for stresses, in² for areas), or '' for ratios. */
export function storedUnitOf(field: string): string {
  for (const columns of Object.values(TABLES)) {
    for (const c of columns as readonly { name: string; quantity?: keyof typeof STORED_UNITS }[]) {
      if (c.name === field && c.quantity) {
        const unit = STORED_UNITS[c.quantity]
        return UNIT_LABELS[unit] ?? unit
      }
    }
  }
  return ''
}

/** Where a queued value sits: "Frame A · L2 · coupon" (with the revision when it is not 0). */
export function locationText(item: ReviewItem): string {
  const l = item.location
  if (!l) return item.field === 'project' ? 'Whole project' : '—'
  return [`Frame ${l.frameLine}`, l.level, l.revision ? `${l.phase} rev. ${l.revision}` : l.phase].join(' · ')
}
