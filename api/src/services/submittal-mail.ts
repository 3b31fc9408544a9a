import { and, eq, or } from 'drizzle-orm'
import type { BraceCheck, CheckItem, SubmittalCheckResponse, SupplierPhase } from '@shared/schemas/projects'
import type { Db } from '../db'
import { users } from '../db/schema'
import type { Mailer, OutgoingMail } from '../mail/mailer'
import { projectByCode } from './projects'
import { submittalCheck } from './submittal'

/**
 * When a recorded supplier snapshot exceeds what the frame was designed for, the principals and the
 * engineer who recorded it hear about it: one mail to every active principal and to the recorder,
 * listing each exceeding item of the recorded braces (the submittal check of that phase and revision).
 */

const ITEM_LABELS: Record<CheckItem['item'], string> = {
  coreArea: 'Core area',
  stiffnessFactor: 'Stiffness factor',
  tmax: 'Tmax',
  cmax: 'Cmax',
  deformationBasis: 'Deformation basis',
  ryBasis: 'Ry basis',
}

/** The exceeding items of the braces at one frame line and level, from a submittal check. */
export function exceedingItems(check: SubmittalCheckResponse, frameLine: string, level: string): { brace: BraceCheck; items: CheckItem[] } | null {
  const brace = check.braces.find(b => b.frameLine === frameLine && b.level === level)
  if (!brace) return null
  const items = brace.items.filter(i => i.status === 'exceeds')
  return items.length ? { brace, items } : null
}

/** The text of the mail (pure, for the test to read). */
export function exceedanceMail(to: string[], input: { code: string; name: string; frameLine: string; level: string; phase: SupplierPhase; revision: number; recordedBy: string; items: CheckItem[]; link: string }): OutgoingMail {
  const what = `${input.phase} rev. ${input.revision}`
  return {
    to: to.join(', '),
    subject: `Backsight: ${input.code} ${what} exceeds the design at frame ${input.frameLine} ${input.level}`,
    text: [
      `${input.recordedBy} recorded the supplier’s ${what} values for the braces at frame line ${input.frameLine}, level ${input.level} of ${input.code} (${input.name}).`,
      '',
      `${input.items.length} check item${input.items.length === 1 ? '' : 's'} exceed${input.items.length === 1 ? 's' : ''} what the frame was designed for:`,
      ...input.items.map(i => `  - ${ITEM_LABELS[i.item]}: ${i.message}`),
      '',
      'A brace above its design Tmax or Cmax raises the capacity-design forces on the beams, columns, connections and foundations: check them again.',
      `The whole submittal check: ${input.link}`,
      '',
      'Backsight is a preliminary design aid. Verify with the supplier’s qualified values and the governing code and edition; the engineer of record decides.',
    ].join('\n'),
  }
}

/**
 * Checks the just-recorded snapshot and, when any item exceeds, sends the one mail.
 * Returns the recipients (empty when nothing exceeds). Mail failures reject; the caller logs them.
 */
export async function mailIfExceeds(
  db: Db,
  mailer: Mailer,
  publicUrl: string,
  input: { code: string; frameLine: string; level: string; phase: SupplierPhase; revision: number; actorId: number },
): Promise<string[]> {
  const check = await submittalCheck(db, input.code, { phase: input.phase, revision: input.revision })
  const found = exceedingItems(check, input.frameLine, input.level)
  if (!found) return []
  const rows = await db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(eq(users.active, true), or(eq(users.role, 'principal'), eq(users.id, input.actorId))))
  const recorder = rows.find(r => r.id === input.actorId)
  const to = [...new Set(rows.map(r => r.email))]
  if (!to.length) return []
  const project = await projectByCode(db, input.code)
  const link = `${publicUrl.replace(/\/$/, '')}/projects/${encodeURIComponent(input.code)}?tab=check&phase=${input.phase}&revision=${input.revision}`
  await mailer.send(exceedanceMail(to, { ...input, name: project.name, recordedBy: recorder?.name ?? 'Someone', items: found.items, link }))
  return to
}
