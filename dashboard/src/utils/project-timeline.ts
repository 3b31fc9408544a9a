import type { FrameView, Phase } from '@shared/schemas/projects'

/**
 * The project's snapshot revisions as one timeline: every (phase, revision) recorded on any brace,
 * in phase order (sd, dd, cd, submittal, approved, coupon) then revision, with the dates and source
 * documents seen, how many brace groups carry it and on how many it is the governing (final) one.
 */
export interface TimelineEntry {
  phase: Phase
  revision: number
  /** Earliest and latest date recorded on it (ISO dates), or null. */
  firstDate: string | null
  lastDate: string | null
  sourceDocuments: string[]
  braces: number
  governing: number
  /** Some value of it still waits in the review queue. */
  unconfirmed: number
  supplier: boolean
}

const ORDER: Record<Phase, number> = { sd: 0, dd: 1, cd: 2, submittal: 3, approved: 4, coupon: 5 }

export function projectTimeline(frames: readonly FrameView[]): TimelineEntry[] {
  const by = new Map<string, TimelineEntry>()
  for (const f of frames) {
    for (const l of f.levels) {
      if (!l.brace) continue
      for (const s of l.brace.snapshots) {
        const key = `${s.phase}:${s.revision}`
        let e = by.get(key)
        if (!e) {
          e = { phase: s.phase, revision: s.revision, firstDate: null, lastDate: null, sourceDocuments: [], braces: 0, governing: 0, unconfirmed: 0, supplier: ORDER[s.phase] >= 3 }
          by.set(key, e)
        }
        e.braces++
        if (s.governing) e.governing++
        if (!s.confirmed) e.unconfirmed++
        if (s.date) {
          if (!e.firstDate || s.date < e.firstDate) e.firstDate = s.date
          if (!e.lastDate || s.date > e.lastDate) e.lastDate = s.date
        }
        if (s.sourceDocument && !e.sourceDocuments.includes(s.sourceDocument)) e.sourceDocuments.push(s.sourceDocument)
      }
    }
  }
  return [...by.values()].sort((a, b) => ORDER[a.phase] - ORDER[b.phase] || a.revision - b.revision)
}

/** The number of brace groups (story × frame line with braces) of the project. */
export function braceGroupCount(frames: readonly FrameView[]): number {
  return frames.reduce((n, f) => n + f.levels.filter(l => l.brace).length, 0)
}
