import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'

interface Captured {
  id: string
  to: string[]
  subject: string
  text: string
}

/** Waits for the test mail sink to hold a message to `to` (polls its folder). */
export async function waitForMail(to: string, { timeoutMs = 8_000, after = 0 } = {}): Promise<Captured> {
  const dir = process.env.MAIL_SINK_DIR
  if (!dir) throw new Error('MAIL_SINK_DIR is not set: run the suite with `npm test`, which starts the mail sink.')
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    const names = (await readdir(dir)).filter(n => n.endsWith('.json')).sort()
    for (const name of names.reverse()) {
      const m = JSON.parse(await readFile(join(dir, name), 'utf8')) as Captured & { receivedAt: string }
      if (m.to.includes(to) && Date.parse(m.receivedAt) >= after) return m
    }
    await new Promise(r => setTimeout(r, 100))
  }
  throw new Error(`No mail to ${to} arrived within ${timeoutMs} ms`)
}

/** The one-time token in a message's set-password link. */
export function tokenFrom(text: string): string {
  const m = /set-password\?token=([A-Za-z0-9_-]+)/.exec(text)
  if (!m?.[1]) throw new Error(`No set-password link in:\n${text}`)
  return m[1]
}
