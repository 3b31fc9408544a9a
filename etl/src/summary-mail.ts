import { and, eq, sql } from 'drizzle-orm'
import type { Db } from '../../api/src/db'
import { users } from '../../api/src/db/schema'
import { loadConfig } from '../../api/src/config'
import { createMailer } from '../../api/src/mail/mailer'
import type { RunSummary } from './run'

export interface Exceedance {
  projectCode: string
  frameLine: string
  level: string
  assumedBeta: number | null
  finalBeta: number | null
  assumedOmega: number | null
  finalOmega: number | null
  assumedCompressionKip: number | null
  finalCompressionKip: number | null
}

/**
 * Braces of the run's projects whose final (governing) supplier values exceed the assumed (schematic)
 * ones — β, ω, or the adjusted compression strength that sized beams, columns and connections.
 */
export async function findExceedances(db: Db, runId: number): Promise<Exceedance[]> {
  const rows = await db.execute(sql`
    select p.code as "projectCode", f.frame_line as "frameLine", l.name as level,
           a.beta as "assumedBeta", g.beta as "finalBeta", a.omega as "assumedOmega", g.omega as "finalOmega",
           a.adjusted_compression_kip as "assumedCompressionKip", g.adjusted_compression_kip as "finalCompressionKip"
    from projects p
    join frames f on f.project_id = p.id
    join levels l on l.frame_id = f.id
    join braces b on b.level_id = l.id
    join brace_snapshots a on a.brace_id = b.id and a.phase = 'sd'
    join brace_snapshots g on g.brace_id = b.id and g.governing
    where p.import_run_id = ${runId} and g.confirmed
      and (g.beta > a.beta or g.omega > a.omega or g.adjusted_compression_kip > a.adjusted_compression_kip * (1 + 1e-9))
    order by p.code, f.frame_line, l.level_index`)
  return rows.rows as unknown as Exceedance[]
}

const f2 = (v: number | null) => (v === null ? '—' : v.toFixed(2))
const f0 = (v: number | null) => (v === null ? '—' : v.toFixed(0))

/** E-mails the run's summary to every active principal. Returns how many were sent (0 when mail is down). */
export async function mailRunSummary(db: Db, summary: RunSummary): Promise<number> {
  if (summary.runId === null) return 0
  const principals = await db.select({ email: users.email }).from(users).where(and(eq(users.role, 'principal'), eq(users.active, true)))
  if (!principals.length) return 0
  const exceed = await findExceedances(db, summary.runId)
  const lines = exceed.slice(0, 100).map(
    e => `  ${e.projectCode} frame ${e.frameLine} ${e.level}: β ${f2(e.assumedBeta)} → ${f2(e.finalBeta)}, ω ${f2(e.assumedOmega)} → ${f2(e.finalOmega)}, Cmax ${f0(e.assumedCompressionKip)} → ${f0(e.finalCompressionKip)} kip`,
  )
  const text = [
    `Import run ${summary.runId} finished (${summary.files.join(', ')}).`,
    '',
    `Projects: ${summary.loaded} loaded, ${summary.updated} updated, ${summary.unchanged} unchanged, ${summary.rejected} rejected; ${summary.queued} values wait for review.`,
    '',
    exceed.length
      ? `Braces whose final supplier values exceed the assumed ones (${exceed.length}) — the frame members and connections of these were sized for less:`
      : 'No brace in this run has final supplier values above the assumed ones.',
    ...lines,
    exceed.length > lines.length ? `  … and ${exceed.length - lines.length} more; see the Imports screen.` : '',
    '',
    'Backsight is a preliminary design aid. Verify with the supplier’s qualified values and the governing code and edition; the engineer of record decides.',
  ].join('\n')
  const mailer = createMailer(loadConfig(process.env).smtp)
  try {
    await mailer.send({ to: principals.map(p => p.email).join(', '), subject: `Backsight import run ${summary.runId}: ${exceed.length} brace(s) above assumptions`, text })
    return principals.length
  } catch {
    return 0
  } finally {
    mailer.close()
  }
}
