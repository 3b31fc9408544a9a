import { proposalSheet } from '@shared/benchmarks/proposal-sheet'
import type { ProposalEmailBody, ProposalEmailSent } from '@shared/schemas/benchmarks'
import type { Db } from '../db'
import { auditLog } from '../db/schema'
import { HttpError } from '../errors'
import type { Mailer } from '../mail/mailer'
import { proposal } from './benchmarks'
import { proposalFileName, renderSheetPdf } from './proposal-pdf'

/**
 * E-mails the proposal sheet of `body.profile` to `body.to` as a PDF attachment, and records who
 * sent what to whom in `audit_log` (`benchmark.proposal-email`). The message names no project or client.
 */
export async function emailProposal(db: Db, mailer: Mailer, actor: { id: number; name: string }, body: ProposalEmailBody): Promise<ProposalEmailSent> {
  const result = await proposal(db, body.profile)
  const sheet = proposalSheet(body.profile, result)
  const fileName = proposalFileName(body.profile)
  const pdf = await renderSheetPdf(sheet)
  const lines = [
    `${actor.name} sent you a steel tonnage benchmark from Backsight (attached: ${fileName}).`,
    '',
    ...sheet.profile.map(p => `${p.label}: ${p.value}`),
    '',
    sheet.basis,
    ...sheet.expected.map(e => `${e.label}: ${e.low}–${e.high} ${e.unit} (median ${e.median}).`),
    '',
    'Preliminary design aid: verify with the supplier’s qualified values and the governing code; the engineer of record decides.',
  ]
  try {
    await mailer.send({
      to: body.to,
      subject: `Steel tonnage benchmark: ${sheet.profile[0]!.value.toLowerCase()}, ${body.profile.stories} stories`,
      text: lines.join('\n'),
      attachments: [{ filename: fileName, content: pdf, contentType: 'application/pdf' }],
    })
  } catch {
    throw new HttpError(503, 'SERVICE_UNAVAILABLE', 'The e-mail could not be sent: the mail server did not answer. Download the PDF instead, or try again later.')
  }
  await db.insert(auditLog).values({
    actorId: actor.id,
    action: 'benchmark.proposal-email',
    entity: 'proposal',
    entityId: null,
    detail: { to: body.to, profile: body.profile, group: result.group, fileName, bytes: pdf.length },
  })
  return { to: body.to, fileName }
}
