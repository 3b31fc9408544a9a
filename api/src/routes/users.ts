import { InviteUserBody, UpdateUserBody, UserId } from '@shared/schemas/users'
import type { AppDeps } from '../app'
import { inviteMail } from '../mail/templates'
import { createInvitedUser, INVITE_HOURS, listUsers, reissueInvite, toAdminUser, updateUser } from '../services/users'
import type { RouteSpec } from './route-table'

export function userRoutes({ db, mailer, config }: AppDeps): RouteSpec[] {
  async function sendInvite(email: string, name: string, token: string, log?: { error: (o: object, m: string) => void }) {
    try {
      // False when the mail service is down: the invitation waits in the outbox and goes when it is back.
      return await mailer.send(inviteMail(email, name, `${config.publicUrl}/set-password?token=${token}`, INVITE_HOURS))
    } catch (err) {
      log?.error({ err }, 'invitation mail failed')
      return false
    }
  }

  return [
    {
      method: 'get',
      path: '/api/users',
      access: ['admin'],
      handler: async (_req, res) => {
        res.json({ items: await listUsers(db) })
      },
    },
    {
      method: 'post',
      path: '/api/users/invitations',
      access: ['admin'],
      handler: async (req, res) => {
        const body = InviteUserBody.parse(req.body)
        const { user, token } = await createInvitedUser(db, req.user!.id, body)
        const mailDelivered = await sendInvite(user.email, user.name, token, req.log)
        res.status(201).json({ user: toAdminUser(user), mailDelivered })
      },
    },
    {
      method: 'post',
      path: '/api/users/:userId/invitation',
      access: ['admin'],
      handler: async (req, res) => {
        const { user, token } = await reissueInvite(db, req.user!.id, UserId.parse(req.params.userId))
        const mailDelivered = await sendInvite(user.email, user.name, token, req.log)
        res.status(201).json({ user: toAdminUser(user), mailDelivered })
      },
    },
    {
      method: 'patch',
      path: '/api/users/:userId',
      access: ['admin'],
      handler: async (req, res) => {
        const userId = UserId.parse(req.params.userId)
        res.json(await updateUser(db, req.user!.id, userId, UpdateUserBody.parse(req.body)))
      },
    },
  ]
}
