import { sql } from 'drizzle-orm'
import { boolean, index, integer, jsonb, pgEnum, pgTable, serial, text, timestamp, uniqueIndex, varchar, json } from 'drizzle-orm/pg-core'

export const roleEnum = pgEnum('role', ['admin', 'principal', 'engineer', 'bd'])
export const unitSystemEnum = pgEnum('unit_system', ['us', 'si'])
export const tokenKindEnum = pgEnum('token_kind', ['invite', 'reset'])

export const users = pgTable(
  'users',
  {
    id: serial('id').primaryKey(),
    email: varchar('email', { length: 254 }).notNull(),
    name: varchar('name', { length: 120 }).notNull(),
    role: roleEnum('role').notNull(),
    /** Null until the user sets a password from an invitation. */
    passwordHash: text('password_hash'),
    active: boolean('active').notNull().default(true),
    units: unitSystemEnum('units').notNull().default('us'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    lastSignInAt: timestamp('last_sign_in_at', { withTimezone: true }),
    /** Wrong passwords in a row since the last good sign-in (api/src/services/sign-in-backoff.ts). */
    failedSignIns: integer('failed_sign_ins').notNull().default(0),
    /** Sign-in refused until then; a password reset lifts it. */
    signInBlockedUntil: timestamp('sign_in_blocked_until', { withTimezone: true }),
  },
  t => [uniqueIndex('users_email_key').on(sql`lower(${t.email})`)],
)

/** One-time links for invitations and password resets. Only the SHA-256 of the token is stored. */
export const userTokens = pgTable(
  'user_tokens',
  {
    id: serial('id').primaryKey(),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: tokenKindEnum('kind').notNull(),
    tokenHash: varchar('token_hash', { length: 64 }).notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [uniqueIndex('user_tokens_hash_key').on(t.tokenHash), index('user_tokens_user_idx').on(t.userId)],
)

/** Who changed what. `detail` holds the before/after values of the change. */
export const auditLog = pgTable(
  'audit_log',
  {
    id: serial('id').primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    actorId: integer('actor_id').references(() => users.id, { onDelete: 'set null' }),
    action: varchar('action', { length: 80 }).notNull(),
    entity: varchar('entity', { length: 80 }).notNull(),
    entityId: varchar('entity_id', { length: 80 }),
    detail: jsonb('detail').notNull().default({}),
  },
  t => [index('audit_log_entity_idx').on(t.entity, t.entityId)],
)

/** express-session store table, in the layout connect-pg-simple expects. */
export const session = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  t => [index('IDX_session_expire').on(t.expire)],
)

/** Firm-wide settings, one JSON value per key (e.g. `sizing-defaults`), validated by shared schemas. */
export const firmSettings = pgTable('firm_settings', {
  key: varchar('key', { length: 80 }).primaryKey(),
  value: jsonb('value').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: integer('updated_by').references(() => users.id, { onDelete: 'set null' }),
})

/** Each user's working copy of a screen's form (the New frame worksheet), so it survives a reload. */
export const worksheets = pgTable(
  'worksheets',
  {
    id: serial('id').primaryKey(),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: varchar('kind', { length: 40 }).notNull(),
    state: jsonb('state').notNull(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [uniqueIndex('worksheets_user_kind_key').on(t.userId, t.kind)],
)

/**
 * Every e-mail, kept until the mail service has taken it: a message that cannot be delivered now
 * (the service is down) is retried until it goes (api/src/mail/outbox.ts).
 */
export const outbox = pgTable(
  'outbox',
  {
    id: serial('id').primaryKey(),
    to: varchar('to', { length: 254 }).notNull(),
    subject: varchar('subject', { length: 300 }).notNull(),
    text: text('text').notNull(),
    /** Attachments with base64 content. */
    attachments: jsonb('attachments'),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  t => [index('outbox_pending_idx').on(t.nextAttemptAt).where(sql`${t.sentAt} is null`)],
)
