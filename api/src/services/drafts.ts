import { like, sql } from 'drizzle-orm'
import { sizeFrame } from '@shared/engineering/size-frame'
import type { SizingRequest } from '@shared/schemas/sizing'
import { fromDisplay } from '@shared/units/systems'
import type { Db } from '../db'
import { braces, braceSnapshots, frames, levels, projects } from '../db/history-schema'
import { auditLog } from '../db/schema'
import { refreshCalibrationPairs } from '../db/calibration'

/**
 * Saves a New frame worksheet as a draft project: its geometry, shears and assumed factors become
 * the schematic-design (`sd`) snapshot, so the supplier's values can be recorded against it later
 * (by import, with the same project code) and today's work becomes tomorrow's history.
 */
export async function createDraftProject(db: Db, actorId: number, name: string, request: SizingRequest): Promise<{ projectId: number; code: string }> {
  const result = sizeFrame(request)
  const sys = request.units
  const year = new Date().getUTCFullYear()
  const saved = await db.transaction(async tx => {
    // Serialise draft numbering so two saves at once cannot take the same code.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('draft-codes'))`)
    const prefix = `DRAFT-${year}-`
    const [{ n }] = (await tx.select({ n: sql<number>`count(*)`.mapWith(Number) }).from(projects).where(like(projects.code, `${prefix}%`))) as [{ n: number }]
    const code = `${prefix}${String(n + 1).padStart(3, '0')}`
    const totalHeightIn = request.levels.reduce((h, l) => h + fromDisplay('dimension', l.storyHeight, sys), 0)
    const [project] = await tx
      .insert(projects)
      .values({ code, name, draft: true, yearDesigned: year, phaseReached: 'sd', stories: request.levels.length, heightFt: totalHeightIn / 12, clientConfidential: true })
      .returning({ id: projects.id })
    const [frame] = await tx
      .insert(frames)
      .values({ projectId: project!.id, frameLine: 'A', configuration: request.configuration, bays: request.bracedBays, bayWidthIn: fromDisplay('dimension', request.bayWidth, sys) })
      .returning({ id: frames.id })
    const basis = request.capacityBasis
    for (const [i, level] of result.levels.entries()) {
      const [lv] = await tx
        .insert(levels)
        .values({ frameId: frame!.id, name: level.name, levelIndex: i + 1, storyHeightIn: fromDisplay('dimension', level.storyHeight, sys), storyShearKip: fromDisplay('force', level.storyShear, sys) })
        .returning({ id: levels.id })
      const [br] = await tx
        .insert(braces)
        .values({
          levelId: lv!.id,
          braceCount: level.bracesAtLevel,
          angleDeg: level.angleDeg,
          workPointLengthIn: fromDisplay('dimension', level.braceLength, sys),
          requiredStrengthKip: fromDisplay('force', level.braceAxialDemand, sys),
          method: request.method,
        })
        .returning({ id: braces.id })
      await tx.insert(braceSnapshots).values({
        braceId: br!.id,
        phase: 'sd',
        revision: 0,
        date: new Date().toISOString().slice(0, 10),
        sourceDocument: 'New frame worksheet',
        requiredCoreAreaIn2: fromDisplay('area', level.requiredCoreArea, sys),
        coreAreaIn2: fromDisplay('area', level.coreArea, sys),
        fyscKsi: fromDisplay('stress', request.fyscMin, sys),
        fyscBasis: basis.kind === 'ry' ? 'specified_min' : basis.kind === 'yieldRange' ? 'yield_range' : 'coupon',
        fyscMaxKsi: basis.kind === 'yieldRange' ? fromDisplay('stress', basis.fyscMax, sys) : null,
        ry: basis.kind === 'ry' ? basis.ry : null,
        beta: request.beta,
        omega: request.omega,
        stiffnessFactor: request.stiffnessFactor,
        yieldLengthRatio: request.yieldLengthRatio,
        adjustedTensionKip: fromDisplay('force', level.adjustedTension, sys),
        adjustedCompressionKip: fromDisplay('force', level.adjustedCompression, sys),
      })
    }
    await tx.insert(auditLog).values({ actorId, action: 'project.create-draft', entity: 'project', entityId: code, detail: { name, levels: result.levels.length } })
    return { projectId: project!.id, code }
  })
  // A draft never counts in analytics, but the history caches follow the data version.
  await refreshCalibrationPairs(db, [saved.projectId])
  return saved
}
