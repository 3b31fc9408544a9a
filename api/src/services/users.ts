import { createHash, randomBytes } from 'node:crypto'
import { and, asc, eq, isNull, sql } from 'drizzle-orm'
import type { Role } from '@shared/auth/roles'
import type { User, UnitSystem } from '@shared/schemas/auth'
import type { AdminUser } from '@shared/schemas/users'
import type { Db, DbOrTx } from '../db'
import { auditLog, session, users, userTokens } from '../db/schema'
import { conflict, notFound } from '../errors'
import { hashPassword } from './passwords'

export type UserRow = typeof users.$inferSelect

export const INVITE_HOURS = 72
export const RESET_MINUTES = 60

export function toUser(row: UserRow): User {
  return { id: row.id, email: row.email, name: row.name, role: row.role, active: row.active, units: row.units } satisfies User
}

export function toAdminUser(row: UserRow): AdminUser {
  return {
    ...toUser(row),
    createdAt: row.createdAt.toISOString(),
    lastSignInAt: row.lastSignInAt?.toISOString() ?? null,
    pendingInvite: row.passwordHash === null,
  } satisfies AdminUser
}

export async function findUserByEmail(db: Db, email: string): Promise<UserRow | undefined> {
  const [row] = await db.select().from(users).where(sql`lower(${users.email}) = ${email.toLowerCase()}`)
  return row
}

export async function findUserById(db: Db, id: number): Promise<UserRow | undefined> {
  const [row] = await db.select().from(users).where(eq(users.id, id))
  return row
}

export async function listUsers(db: Db): Promise<AdminUser[]> {
  const rows = await db.select().from(users).orderBy(asc(users.email))
  return rows.map(toAdminUser)
}

export async function recordSignIn(db: Db, id: number): Promise<void> {
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, id))
}

export async function updatePreferences(db: Db, id: number, changes: { units?: UnitSystem; name?: string }): Promise<User> {
  const [row] = await db.update(users).set({ ...changes, updatedAt: new Date() }).where(eq(users.id, id)).returning()
  if (!row) throw notFound('That user')
  return toUser(row)
}

/** Creates a user with no password yet; they choose one from the invitation link. */
export async function createInvitedUser(
  db: Db,
  actorId: number,
  input: { email: string; name: string; role: Role },
): Promise<{ user: UserRow; token: string }> {
  if (await findUserByEmail(db, input.email)) throw conflict('A user with that e-mail address already exists.')
  return db.transaction(async tx => {
    const [user] = await tx.insert(users).values({ email: input.email, name: input.name, role: input.role }).returning()
    if (!user) throw new Error('insert returned no row')
    const token = await issueToken(tx, user.id, 'invite')
    await tx.insert(auditLog).values({
      actorId,
      action: 'user.invite',
      entity: 'user',
      entityId: String(user.id),
      detail: { email: user.email, role: user.role },
    })
    return { user, token }
  })
}

/** A new invitation for a user who has not set a password yet. */
export async function reissueInvite(db: Db, actorId: number, userId: number): Promise<{ user: UserRow; token: string }> {
  const user = await findUserById(db, userId)
  if (!user) throw notFound('That user')
  if (user.passwordHash !== null) throw conflict('This user has already set a password; they can use “Forgot password”.')
  const token = await issueToken(db, user.id, 'invite')
  await db.insert(auditLog).values({ actorId, action: 'user.reinvite', entity: 'user', entityId: String(user.id), detail: {} })
  return { user, token }
}

/** Changes role and/or active flag. An admin cannot demote or deactivate themselves (no lock-out). */
export async function updateUser(db: Db, actorId: number, userId: number, changes: { role?: Role; active?: boolean }): Promise<AdminUser> {
  const before = await findUserById(db, userId)
  if (!before) throw notFound('That user')
  if (userId === actorId && ((changes.role && changes.role !== before.role) || changes.active === false)) {
    throw conflict('You cannot remove your own administrator access. Ask another administrator.')
  }
  return db.transaction(async tx => {
    const [row] = await tx.update(users).set({ ...changes, updatedAt: new Date() }).where(eq(users.id, userId)).returning()
    if (!row) throw notFound('That user')
    const detail: Record<string, unknown> = {}
    if (changes.role !== undefined && changes.role !== before.role) detail.role = { from: before.role, to: changes.role }
    if (changes.active !== undefined && changes.active !== before.active) detail.active = { from: before.active, to: changes.active }
    await tx.insert(auditLog).values({ actorId, action: 'user.update', entity: 'user', entityId: String(userId), detail })
    if (changes.active === false || (changes.role && changes.role !== before.role)) {
      // End their sessions now: a deactivated user, or one whose role shrank, must not keep old access.
      await tx.delete(session).where(sql`${session.sess}->'passport'->>'user' = ${String(userId)}`)
    }
    return toAdminUser(row)
  })
}

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex')

/** Issues a one-time token; older unused tokens of the same kind stop working. */
export async function issueToken(db: DbOrTx, userId: number, kind: 'invite' | 'reset'): Promise<string> {
  const token = randomBytes(32).toString('base64url')
  const ms = kind === 'invite' ? INVITE_HOURS * 3600_000 : RESET_MINUTES * 60_000
  await db
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(userTokens.userId, userId), eq(userTokens.kind, kind), isNull(userTokens.usedAt)))
  await db.insert(userTokens).values({ userId, kind, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + ms) })
  return token
}

/** The token's user and kind while it is unused and unexpired; otherwise undefined. */
export async function findLiveToken(db: Db, token: string) {
  const [row] = await db
    .select({ token: userTokens, user: users })
    .from(userTokens)
    .innerJoin(users, eq(users.id, userTokens.userId))
    .where(eq(userTokens.tokenHash, hashToken(token)))
  if (!row || row.token.usedAt || row.token.expiresAt.getTime() <= Date.now() || !row.user.active) return undefined
  return row
}

/** Uses a token to set a password. Single use: the update only succeeds while `used_at` is null. */
export async function setPasswordWithToken(db: Db, token: string, password: string): Promise<UserRow | undefined> {
  const live = await findLiveToken(db, token)
  if (!live) return undefined
  const passwordHash = await hashPassword(password)
  return db.transaction(async tx => {
    const claimed = await tx
      .update(userTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(userTokens.id, live.token.id), isNull(userTokens.usedAt)))
      .returning({ id: userTokens.id })
    if (claimed.length === 0) return undefined
    // A reset lifts any sign-in block: the owner proved they read the account's mailbox.
    const [user] = await tx.update(users).set({ passwordHash, failedSignIns: 0, signInBlockedUntil: null, updatedAt: new Date() }).where(eq(users.id, live.user.id)).returning()
    await tx.insert(auditLog).values({
      actorId: live.user.id,
      action: live.token.kind === 'invite' ? 'user.accept-invite' : 'user.reset-password',
      entity: 'user',
      entityId: String(live.user.id),
      detail: {},
    })
    // Any session signed in with the old password ends.
    await tx.delete(session).where(sql`${session.sess}->'passport'->>'user' = ${String(live.user.id)}`)
    return user
  })
}

/** Demo accounts, one per role. Created when missing; password reset when `force` is set. */
export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: 'admin@example.com', name: 'Avery Admin', role: 'admin' },
  { email: 'principal@example.com', name: 'Priya Principal', role: 'principal' },
  { email: 'engineer@example.com', name: 'Emil Engineer', role: 'engineer' },
  { email: 'bd@example.com', name: 'Blair Business', role: 'bd' },
]

export async function ensureDemoUsers(db: Db, password: string, { force = false } = {}): Promise<number> {
  const hash = await hashPassword(password)
  let changed = 0
  for (const demo of DEMO_USERS) {
    const existing = await findUserByEmail(db, demo.email)
    if (!existing) {
      await db.insert(users).values({ ...demo, passwordHash: hash })
      changed++
    } else if (force) {
      await db.update(users).set({ passwordHash: hash, active: true, role: demo.role }).where(eq(users.id, existing.id))
      changed++
    }
  }
  return changed
}
