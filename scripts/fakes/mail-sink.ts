import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'

/**
 * A local SMTP sink: accepts every message on 127.0.0.1 and keeps it in `dir` as
 * `<id>.eml` (the raw message) plus `<id>.json` (what the demo mailbox screen reads).
 * It stands in for the firm's mail relay in development and tests.
 */
export interface MailSink {
  port: number
  dir: string
  close: () => Promise<void>
}

let seq = 0

export function startMailSink({ port, dir, host = '127.0.0.1' }: { port: number; dir: string; host?: string }): Promise<MailSink> {
  mkdirSync(dir, { recursive: true })
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('end', () => {
        const raw = Buffer.concat(chunks)
        simpleParser(raw)
          .then(parsed => {
            const id = `${Date.now().toString().padStart(14, '0')}-${process.pid}-${(seq++).toString().padStart(5, '0')}`
            const to = session.envelope.rcptTo.map(r => r.address)
            const message = {
              id,
              to,
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              subject: parsed.subject ?? '',
              receivedAt: new Date().toISOString(),
              text: parsed.text ?? '',
            }
            writeFileSync(join(dir, `${id}.eml`), raw)
            writeFileSync(join(dir, `${id}.json`), JSON.stringify(message, null, 2))
            callback()
          })
          .catch(err => callback(err as Error))
      })
    },
  })
  return new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, host, () => {
      const addr = server.server.address()
      resolve({
        port: typeof addr === 'object' && addr ? addr.port : port,
        dir,
        close: () => new Promise(r => server.close(() => r())),
      })
    })
  })
}
