import nodemailer from 'nodemailer'
import type { Config } from '../config'

export interface OutgoingMail {
  to: string
  subject: string
  text: string
  /** Files sent with the message (e.g. a PDF). */
  attachments?: { filename: string; content: Buffer; contentType: string }[]
}

export interface Mailer {
  /** Rejects when the transport refuses the message; the outbox mailer answers whether it went now. */
  send(mail: OutgoingMail): Promise<boolean | void>
  close(): void
}

/**
 * Sends through whatever SMTP server the configuration names: the local sink in
 * development and tests, the firm's relay in production. No code differs between them.
 */
export function createMailer(smtp: Config['smtp']): Mailer {
  const transport = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    ignoreTLS: !smtp.secure && (smtp.host === '127.0.0.1' || smtp.host === 'localhost'),
    auth: smtp.user ? { user: smtp.user, pass: smtp.pass ?? '' } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
  })
  return {
    async send(mail) {
      await transport.sendMail({ from: smtp.from, to: mail.to, subject: mail.subject, text: mail.text, attachments: mail.attachments })
    },
    close: () => transport.close(),
  }
}
