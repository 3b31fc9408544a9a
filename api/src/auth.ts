import { Passport } from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { Request } from 'express'
import type { Db } from './db'
import { userRowOfRequest } from './session-store'
import { checkPassword } from './services/passwords'
import { clearSignInFailures, recordFailedSignIn } from './services/sign-in-backoff'
import { findUserByEmail, findUserById, toUser } from './services/users'

/**
 * One Passport instance per app (a module-level singleton would collect a serializer
 * per test app). Sessions store only the user id; each request reloads the user so a
 * deactivation or role change takes effect at once.
 */
export function createPassport(db: Db): InstanceType<typeof Passport> {
  const passport = new Passport()
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      void (async () => {
        const row = await findUserByEmail(db, email)
        if (row?.signInBlockedUntil && row.signInBlockedUntil > new Date()) return done(null, false, { message: 'blocked', blockedUntil: row.signInBlockedUntil } as { message: string })
        // checkPassword always pays for one bcrypt comparison, user or not.
        const ok = await checkPassword(password, row?.passwordHash)
        if (row && !ok) await recordFailedSignIn(db, row.id)
        if (!row || !ok || !row.active) return done(null, false)
        if (row.failedSignIns > 0) await clearSignInFailures(db, row.id)
        done(null, toUser(row))
      })().catch(done)
    }),
  )
  passport.serializeUser((user, done) => done(null, user.id))
  passport.deserializeUser((req: Request, id: number, done: (err: unknown, user?: Express.User | false) => void) => {
    // Usually read in the same query as the session (readUserWithSession).
    const read = userRowOfRequest(req, id)
    const row = read !== undefined ? Promise.resolve(read) : findUserById(db, id)
    row.then(r => done(null, r && r.active ? toUser(r) : false)).catch(done)
  })
  return passport
}
