import { and, eq, sql } from 'drizzle-orm'
import type { Db } from '../../api/src/db'
import { users } from '../../api/src/db/schema'
import { loadConfig, type Config } from '../../api/src/config'
import { createMailer } from '../../api/src/mail/mailer'
import { createOutboxMailer } from '../../api/src/mail/outbox'
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
  assumedTensionKip: number | null
  finalTensionKip: number | null
}

/** How far the final adjusted strength passed the assumed one, as a fraction (0.08 = 8 % over). */
const overrun = (e: Exceedance) =>
  Math.max((e.finalCompressionKip ?? 0) / (e.assumedCompressionKip || Infinity), (e.finalTensionKip ?? 0) / (e.assumedTensionKip || Infinity)) - 1

/**
 * Braces of the run's projects whose final (governing) adjusted strengths exceed the assumed
 * (schematic) ones: the frame's beams, columns and connections were sized for less. A higher final
 * ω alone is not listed when a lower final yield stress more than offsets it.
 */
export async function findExceedances(db: Db, runId: number): Promise<Exceedance[]> {
  const rows = await db.execute(sql`
    select p.code as "projectCode", f.frame_line as "frameLine", l.name as level,
           a.beta as "assumedBeta", g.beta as "finalBeta", a.omega as "assumedOmega", g.omega as "finalOmega",
           a.adjusted_compression_kip as "assumedCompressionKip", g.adjusted_compression_kip as "finalCompressionKip",
           a.adjusted_tension_kip as "assumedTensionKip", g.adjusted_tension_kip as "finalTensionKip"
    from projects p
    join frames f on f.project_id = p.id
    join levels l on l.frame_id = f.id
    join braces b on b.level_id = l.id
    join brace_snapshots a on a.brace_id = b.id and a.phase = 'sd'
    join brace_snapshots g on g.brace_id = b.id and g.governing
    where p.import_run_id = ${runId} and g.confirmed
      and (g.adjusted_compression_kip > a.adjusted_compression_kip * (1 + 1e-9) or g.adjusted_tension_kip > a.adjusted_tension_kip * (1 + 1e-9))
    order by p.code, f.frame_line, l.level_index`)
  return rows.rows as unknown as Exceedance[]
}

const f2 = (v: number | null) => (v === null ? '—' : v.toFixed(2))
const f0 = (v: number | null) => (v === null ? '—' : v.toFixed(0))

/** E-mails the run's summary to every active principal (kept in the outbox until delivered). Returns how many it was addressed to. */
export async function mailRunSummary(db: Db, summary: RunSummary, smtp: Config['smtp'] = loadConfig(process.env).smtp): Promise<number> {
  if (summary.runId === null) return 0
  const principals = await db.select({ email: users.email }).from(users).where(and(eq(users.role, 'principal'), eq(users.active, true)))
  if (!principals.length) return 0
  const exceed = await findExceedances(db, summary.runId)
  // One line per project, with its worst brace.
  const byProject = new Map<string, Exceedance[]>()
  for (const e of exceed) byProject.set(e.projectCode, [...(byProject.get(e.projectCode) ?? []), e])
  const lines = [...byProject.entries()].slice(0, 60).map(([code, list]) => {
    const worst = list.reduce((a, b) => (overrun(b) > overrun(a) ? b : a))
    return `  ${code}: ${list.length} brace group(s); worst frame ${worst.frameLine} ${worst.level} +${(overrun(worst) * 100).toFixed(1)} % (β ${f2(worst.assumedBeta)} → ${f2(worst.finalBeta)}, ω ${f2(worst.assumedOmega)} → ${f2(worst.finalOmega)}, Cmax ${f0(worst.assumedCompressionKip)} → ${f0(worst.finalCompressionKip)} kip)`
  })
  const text = [
    `Import run ${summary.runId} finished (${summary.files.length > 3 ? `${summary.files.length} files` : summary.files.join(', ')}).`,
    '',
    `Projects: ${summary.loaded} loaded, ${summary.updated} updated, ${summary.unchanged} unchanged, ${summary.rejected} rejected; ${summary.queued} values wait for review.`,
    '',
    exceed.length
      ? `Braces whose final adjusted strengths exceed the assumed ones — ${exceed.length} brace group(s) in ${byProject.size} project(s); their beams, columns and connections were sized for less:`
      : 'No brace in this run has final supplier values above the assumed ones.',
    ...lines,
    byProject.size > lines.length ? `  … and ${byProject.size - lines.length} more projects; see the Imports screen.` : '',
    '',
    'Backsight is a preliminary design aid. Verify with the supplier’s qualified values and the governing code and edition; the engineer of record decides.',
  ].join('\n')
  // Through the outbox: with the mail service down the summary waits there and the app delivers it later.
  const mailer = createOutboxMailer(db, createMailer(smtp))
  try {
    await mailer.send({ to: principals.map(p => p.email).join(', '), subject: `Backsight import run ${summary.runId}: ${byProject.size} project(s) with braces above their assumed strengths`, text })
    return principals.length
  } catch {
    return 0
  } finally {
    mailer.close()
  }
}
