import { eq, sql } from 'drizzle-orm'
import type { Db } from '../db'
import { users } from '../db/schema'

/**
 * Per-account back-off against password guessing (OWASP Authentication Cheat Sheet, "account
 * lockout"): after FREE_ATTEMPTS wrong passwords in a row the account refuses sign-in for a
 * while — 1 minute, doubling with each further failure, never more than MAX_BLOCK_MS — so a
 * guesser gets a handful of tries an hour, while an attacker can never lock the owner out for
 * long: the block ends by itself, and a password reset (a link to the owner's own mailbox) lifts
 * it at once. A good sign-in clears the count. The per-address rate limit still applies on top.
 */
export const FREE_ATTEMPTS = 5
export const MAX_BLOCK_MS = 15 * 60_000

/** How long the account is blocked after its `failures`-th wrong password in a row (0: not blocked). */
export function blockMsAfter(failures: number): number {
  if (failures < FREE_ATTEMPTS) return 0
  return Math.min(60_000 * 2 ** (failures - FREE_ATTEMPTS), MAX_BLOCK_MS)
}

/** Counts a wrong password and blocks the account when the count calls for it. */
export async function recordFailedSignIn(db: Db, userId: number): Promise<void> {
  const [row] = await db
    .update(users)
    .set({ failedSignIns: sql`${users.failedSignIns} + 1` })
    .where(eq(users.id, userId))
    .returning({ failures: users.failedSignIns })
  const ms = blockMsAfter(row?.failures ?? 0)
  if (ms > 0) await db.update(users).set({ signInBlockedUntil: new Date(Date.now() + ms) }).where(eq(users.id, userId))
}

/** A good sign-in or a password reset: the count starts again and any block ends. */
export async function clearSignInFailures(db: Db, userId: number): Promise<void> {
  await db.update(users).set({ failedSignIns: 0, signInBlockedUntil: null }).where(eq(users.id, userId))
}
