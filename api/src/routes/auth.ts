import type { RequestHandler } from 'express'
import { rateLimit } from 'express-rate-limit'
import {
  ForgotPasswordBody,
  SetPasswordBody,
  SignInBody,
  TokenParam,
  UpdatePreferencesBody,
  type TokenInfo,
  type User,
} from '@shared/schemas/auth'
import type { AppDeps } from '../app'
import { HttpError } from '../errors'
import { inviteMail, resetMail } from '../mail/templates'
import {
  findLiveToken,
  findUserByEmail,
  issueToken,
  recordSignIn,
  RESET_MINUTES,
  setPasswordWithToken,
  updatePreferences,
} from '../services/users'
import type { RouteSpec } from './route-table'

export const SIGN_IN_FAILED = 'That e-mail and password do not match an active account.'

function limiter(limit: number, message: string): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new HttpError(429, 'RATE_LIMITED', message)),
  })
}

export function authRoutes({ db, passport, mailer, config, csrf }: AppDeps): RouteSpec[] {
  const signInLimit = limiter(config.signInLimit, 'Too many sign-in attempts from here. Wait 15 minutes and try again.')
  const resetLimit = limiter(config.signInLimit, 'Too many password requests from here. Wait 15 minutes and try again.')

  return [
    {
      method: 'get',
      path: '/api/auth/csrf',
      access: 'public',
      handler: (req, res) => {
        res.json({ token: csrf.generateToken(req) })
      },
    },
    {
      method: 'post',
      path: '/api/auth/sign-in',
      access: 'public',
      before: [signInLimit],
      handler: (req, res, next) => {
        SignInBody.parse(req.body)
        passport.authenticate('local', (err: unknown, user: User | false, info?: { blockedUntil?: Date }) => {
          if (err) return next(err)
          if (info?.blockedUntil) {
            const minutes = Math.max(1, Math.ceil((info.blockedUntil.getTime() - Date.now()) / 60_000))
            return next(new HttpError(429, 'RATE_LIMITED', `Too many wrong passwords for this account. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}, or reset your password from the sign-in page.`))
          }
          if (!user) return next(new HttpError(401, 'UNAUTHENTICATED', SIGN_IN_FAILED))
          const csrfToken = req.session.csrfToken
          // logIn regenerates the session (a new id: no fixation). Carry the CSRF token over
          // so a client that fetched it before signing in can keep using it.
          req.logIn(user, loginErr => {
            if (loginErr) return next(loginErr)
            req.session.csrfToken = csrfToken
            recordSignIn(db, user.id)
              .then(() => res.json(user))
              .catch(next)
          })
        })(req, res, next)
      },
    },
    {
      method: 'post',
      path: '/api/auth/sign-out',
      access: 'signed-in',
      handler: (req, res, next) => {
        req.logout(err => {
          if (err) return next(err)
          req.session.destroy(destroyErr => {
            if (destroyErr) return next(destroyErr)
            res.clearCookie(config.sessionCookieName)
            res.status(204).end()
          })
        })
      },
    },
    {
      method: 'get',
      path: '/api/auth/me',
      access: 'signed-in',
      handler: (req, res) => {
        res.json(req.user)
      },
    },
    {
      method: 'patch',
      path: '/api/auth/me',
      access: 'signed-in',
      handler: async (req, res) => {
        const body = UpdatePreferencesBody.parse(req.body)
        res.json(await updatePreferences(db, req.user!.id, body))
      },
    },
    {
      method: 'post',
      path: '/api/auth/forgot-password',
      access: 'public',
      before: [resetLimit],
      handler: async (req, res) => {
        const { email } = ForgotPasswordBody.parse(req.body)
        const user = await findUserByEmail(db, email)
        if (user && user.active) {
          // An invited user who never set a password gets a fresh invitation instead.
          const kind = user.passwordHash === null ? 'invite' : 'reset'
          const token = await issueToken(db, user.id, kind)
          const link = `${config.publicUrl}/set-password?token=${token}`
          const mail = kind === 'invite' ? inviteMail(user.email, user.name, link, 72) : resetMail(user.email, user.name, link, RESET_MINUTES)
          // Not awaited: the answer must not reveal, by content or by time, whether the address exists.
          mailer.send(mail).catch(err => req.log?.error({ err }, 'password reset mail failed'))
        }
        res.status(202).json({ message: 'If that address belongs to an active account, a reset link is on its way.' })
      },
    },
    {
      method: 'get',
      path: '/api/auth/tokens/:token',
      access: 'public',
      handler: async (req, res) => {
        const token = TokenParam.parse(req.params.token)
        const live = await findLiveToken(db, token)
        if (!live) throw new HttpError(404, 'NOT_FOUND', 'This link has expired or has already been used.')
        res.json({ kind: live.token.kind, email: live.user.email, name: live.user.name } satisfies TokenInfo)
      },
    },
    {
      method: 'post',
      path: '/api/auth/set-password',
      access: 'public',
      before: [resetLimit],
      handler: async (req, res) => {
        const { token, password } = SetPasswordBody.parse(req.body)
        const user = await setPasswordWithToken(db, token, password)
        if (!user) throw new HttpError(404, 'NOT_FOUND', 'This link has expired or has already been used.')
        res.json({ message: 'Your password is set. Sign in with it now.' })
      },
    },
  ]
}
