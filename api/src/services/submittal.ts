import { checkBrace, designSnapshotOf, latestSupplierKey } from '@shared/submittal/check'
import { DESIGN_CAUTIONS, type SubmittalCheckQuery, type SubmittalCheckResponse } from '@shared/schemas/projects'
import type { Db } from '../db'
import { framesOf, projectByCode } from './projects'
import { getSizingDefaults } from './settings'

/**
 * `GET /api/projects/:code/submittal-check`: every brace of the project, its supplier snapshot of the
 * asked phase and revision (default: the latest supplier snapshot recorded on any brace) against its
 * design snapshot, with the firm's tolerance band.
 */
export async function submittalCheck(db: Db, code: string, q: SubmittalCheckQuery): Promise<SubmittalCheckResponse> {
  const project = await projectByCode(db, code)
  const [frames, defaults] = await Promise.all([framesOf(db, project.id), getSizingDefaults(db)])
  const all = frames.flatMap(f => f.levels.flatMap(l => l.brace?.snapshots ?? []))
  const key = q.phase ? { phase: q.phase, revision: q.revision ?? Math.max(0, ...all.filter(s => s.phase === q.phase).map(s => s.revision)) } : latestSupplierKey(all)
  const tolerance = defaults.stiffnessTolerance
  const braces = frames.flatMap(f =>
    f.levels
      .filter(l => l.brace)
      .map(l => {
        const snaps = l.brace!.snapshots
        const supplier = key ? (snaps.find(s => s.phase === key.phase && s.revision === key.revision) ?? null) : null
        return checkBrace({ frameLine: f.frameLine, level: l.name, levelIndex: l.levelIndex }, designSnapshotOf(snaps), supplier, tolerance)
      }),
  )
  const count = (s: string) => braces.filter(b => b.status === s).length
  return {
    code: project.code,
    phase: key?.phase ?? null,
    revision: key?.revision ?? null,
    tolerance,
    summary: { braces: braces.length, pass: count('pass'), exceeds: count('exceeds'), missing: count('missing') },
    braces,
    cautions: [
      'A brace that exceeds its design Tmax or Cmax raises the capacity-design forces on the beams, columns, connections and foundations: check them again.',
      ...DESIGN_CAUTIONS,
    ],
  }
}
