import { z } from 'zod'
import type { AppDeps } from '../app'
import { notFound } from '../errors'
import { getMail, listMail } from '../mail/mailbox'
import type { RouteSpec } from './route-table'

/** The demo mailbox: what the local mail sink captured. Empty and disabled with a real SMTP server. */
export function mailboxRoutes({ config }: AppDeps): RouteSpec[] {
  const dir = config.mailSinkDir
  return [
    {
      method: 'get',
      path: '/api/mailbox',
      access: ['admin'],
      handler: async (_req, res) => {
        res.json({ enabled: !!dir, items: dir ? await listMail(dir) : [] })
      },
    },
    {
      method: 'get',
      path: '/api/mailbox/:messageId',
      access: ['admin'],
      handler: async (req, res) => {
        const id = z.string().max(80).parse(req.params.messageId)
        const message = dir ? await getMail(dir, id) : undefined
        if (!message) throw notFound('That message')
        res.json(message)
      },
    },
  ]
}
