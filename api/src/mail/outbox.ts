import { and, asc, eq, isNull, lte, sql } from 'drizzle-orm'
import type { DbOrTx } from '../db'
import { outbox } from '../db/schema'
import type { Mailer, OutgoingMail } from './mailer'

/** Retry delays after a failed delivery: 15 s, 30 s, 1 min … capped at 15 min; never given up. */
export function retryDelayMs(attempts: number): number {
  return Math.min(15_000 * 2 ** Math.max(0, attempts - 1), 15 * 60_000)
}

type StoredAttachment = { filename: string; contentType: string; base64: string }

/**
 * A mailer that keeps every message in the outbox table first, then hands it to the transport.
 * When the mail service is down the caller still succeeds (the invitation is created, the import
 * finishes); the message waits and `flush` delivers it once the service is back.
 */
export interface OutboxMailer extends Mailer {
  /** Keeps the message, then tries to deliver it: true when it went now, false when it waits. */
  send(mail: OutgoingMail): Promise<boolean>
  /** Delivers what is due (all pending when `all`); returns how many went out. */
  flush(options?: { all?: boolean }): Promise<number>
  /** Flushes every `intervalMs` until closed. */
  start(intervalMs?: number): void
}

export function createOutboxMailer(db: DbOrTx, transport: Mailer, { onError }: { onError?: (err: unknown) => void } = {}): OutboxMailer {
  let timer: ReturnType<typeof setInterval> | undefined
  let flushing: Promise<number> | undefined

  async function deliver(row: typeof outbox.$inferSelect): Promise<boolean> {
    const attachments = (row.attachments as StoredAttachment[] | null)?.map(a => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.base64, 'base64') }))
    try {
      await transport.send({ to: row.to, subject: row.subject, text: row.text, ...(attachments?.length ? { attachments } : {}) })
      await db.update(outbox).set({ sentAt: new Date(), attempts: row.attempts + 1, lastError: null }).where(eq(outbox.id, row.id))
      return true
    } catch (err) {
      const attempts = row.attempts + 1
      await db
        .update(outbox)
        .set({ attempts, lastError: (err instanceof Error ? err.message : String(err)).slice(0, 500), nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)) })
        .where(eq(outbox.id, row.id))
      onError?.(err)
      return false
    }
  }

  async function flushOnce(all: boolean): Promise<number> {
    const due = await db
      .select()
      .from(outbox)
      .where(all ? isNull(outbox.sentAt) : and(isNull(outbox.sentAt), lte(outbox.nextAttemptAt, sql`now()`)))
      .orderBy(asc(outbox.id))
      .limit(100)
    let sent = 0
    for (const row of due) {
      if (await deliver(row)) sent++
      else break // the service is still down: the rest wait for the next round
    }
    return sent
  }

  return {
    async send(mail: OutgoingMail) {
      const [row] = await db
        .insert(outbox)
        .values({
          to: mail.to,
          subject: mail.subject.slice(0, 300),
          text: mail.text,
          attachments: mail.attachments?.map(a => ({ filename: a.filename, contentType: a.contentType, base64: a.content.toString('base64') })) ?? null,
        })
        .returning()
      // Try now; a failure is not the caller's failure — the message stays in the outbox.
      return deliver(row!)
    },
    flush({ all = false } = {}) {
      // One flush at a time, so a message is never handed over twice by overlapping rounds.
      flushing ??= flushOnce(all).finally(() => (flushing = undefined))
      return flushing
    },
    start(intervalMs = 15_000) {
      timer ??= setInterval(() => void this.flush().catch(err => onError?.(err)), intervalMs)
      timer.unref?.()
    },
    close() {
      if (timer) clearInterval(timer)
      timer = undefined
      transport.close()
    },
  }
}
