import { z } from 'zod'

const Bool = z.enum(['true', 'false', '1', '0']).transform(v => v === 'true' || v === '1')

/** Environment read once at start-up; a bad value fails fast with the variable's name. */
const Env = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  DATABASE_URL: z.string().min(1, { message: 'DATABASE_URL is required' }),
  SESSION_SECRET: z.string().min(16).optional(),
  /** Address used in links that e-mails carry; defaults to http://HOST:PORT. */
  PUBLIC_URL: z.string().url().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_SECURE: Bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().default('Backsight <backsight@example.com>'),
  /** Folder where the local mail sink keeps captured messages; enables the demo mailbox screen. */
  MAIL_SINK_DIR: z.string().optional(),
  /** Built dashboard to serve; production mode only. */
  DASHBOARD_DIST: z.string().optional(),
  SIGN_IN_LIMIT: z.coerce.number().int().min(1).default(20),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  /**
   * How long a request waits for the newest data version's answer before it gets the previous
   * version's, marked as such (see api/src/services/answer-freshness.ts); `off`: always wait.
   */
  ANSWER_GRACE_MS: z.union([z.literal('off'), z.coerce.number().int().min(0).max(60_000)]).default(50),
})

export type Config = {
  env: 'development' | 'production' | 'test'
  host: string
  port: number
  databaseUrl: string
  sessionSecret: string
  sessionCookieName: string
  publicUrl: string
  smtp: { host: string; port: number; secure: boolean; user?: string; pass?: string; from: string }
  mailSinkDir?: string
  dashboardDist?: string
  signInLimit: number
  logLevel: string
  /** null: every answer is of the newest data version. */
  answerGraceMs: number | null
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = Env.safeParse(env)
  if (!parsed.success) {
    const lines = parsed.error.issues.map(i => `  ${i.path.join('.')}: ${i.message}`)
    throw new Error(`Invalid environment:\n${lines.join('\n')}`)
  }
  const e = parsed.data
  if (e.NODE_ENV === 'production' && !e.SESSION_SECRET) {
    // A per-process secret still works; sessions just do not survive a restart.
    console.warn('SESSION_SECRET is not set; sessions will end when the server restarts.')
  }
  return {
    env: e.NODE_ENV,
    host: e.HOST,
    port: e.PORT,
    databaseUrl: e.DATABASE_URL,
    sessionSecret: e.SESSION_SECRET ?? crypto.randomUUID() + crypto.randomUUID(),
    sessionCookieName: 'backsight.sid',
    publicUrl: (e.PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, ''),
    smtp: { host: e.SMTP_HOST, port: e.SMTP_PORT, secure: e.SMTP_SECURE, user: e.SMTP_USER, pass: e.SMTP_PASS, from: e.MAIL_FROM },
    mailSinkDir: e.MAIL_SINK_DIR,
    dashboardDist: e.DASHBOARD_DIST,
    signInLimit: e.SIGN_IN_LIMIT,
    logLevel: e.LOG_LEVEL,
    answerGraceMs: e.ANSWER_GRACE_MS === 'off' ? null : e.ANSWER_GRACE_MS,
  }
}
