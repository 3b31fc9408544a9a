import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { MailMessage, type MailSummary } from '@shared/schemas/users'

/**
 * Reads the messages the local mail sink captured (one JSON file per message).
 * Only used when MAIL_SINK_DIR is configured, i.e. with the demo/test sink.
 */
export async function listMail(dir: string, limit = 200): Promise<MailSummary[]> {
  const names = (await readdir(dir).catch(() => [] as string[])).filter(n => n.endsWith('.json')).sort().reverse()
  const items: MailSummary[] = []
  for (const name of names.slice(0, limit)) {
    const m = await readMessageFile(join(dir, name))
    if (m) items.push({ id: m.id, to: m.to, from: m.from, subject: m.subject, receivedAt: m.receivedAt })
  }
  return items
}

export async function getMail(dir: string, id: string): Promise<MailMessage | undefined> {
  if (!/^[A-Za-z0-9_-]{1,80}$/.test(id)) return undefined
  return readMessageFile(join(dir, `${id}.json`))
}

async function readMessageFile(path: string): Promise<MailMessage | undefined> {
  try {
    const parsed = MailMessage.safeParse(JSON.parse(await readFile(path, 'utf8')))
    return parsed.success ? parsed.data : undefined
  } catch {
    return undefined
  }
}
