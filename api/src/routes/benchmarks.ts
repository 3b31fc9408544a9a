import { rateLimit } from 'express-rate-limit'
import { BenchmarkQuery, PROPOSAL_EMAILS_PER_HOUR, ProposalBody, ProposalEmailBody } from '@shared/schemas/benchmarks'
import type { AppDeps } from '../app'
import { HttpError } from '../errors'
import { benchmarks, proposal } from '../services/benchmarks'
import { sendCachedJson } from '../middleware/json-body'
import { emailProposal } from '../services/proposal-mail'
import { proposalFileName, renderProposalPdf } from '../services/proposal-pdf'
import type { RouteSpec } from './route-table'

/** Benchmarks area (principal, business development): `shared/auth/roles.ts` `benchmarks`. */
const benchmarkRoles = ['principal', 'bd'] as const

export function benchmarkRoutes({ db, mailer }: AppDeps): RouteSpec[] {
  // Per signed-in user (the guard has run, so req.user is set): a sheet goes to a person, not a list.
  const emailLimit = rateLimit({
    windowMs: 60 * 60_000,
    limit: PROPOSAL_EMAILS_PER_HOUR,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: req => `user:${req.user?.id ?? 'none'}`,
    handler: (_req, _res, next) => next(new HttpError(429, 'RATE_LIMITED', `At most ${PROPOSAL_EMAILS_PER_HOUR} proposal e-mails an hour; wait a while, or download the PDF and send it yourself.`)),
  })
  return [
    {
      method: 'get',
      path: '/api/benchmarks',
      access: benchmarkRoles,
      handler: async (req, res) => {
        // Kept per data version: its JSON, gzip and ETag are kept with it.
        sendCachedJson(req, res, await benchmarks(db, BenchmarkQuery.parse(req.query), req.user?.role))
      },
    },
    {
      method: 'post',
      path: '/api/benchmarks/proposal',
      access: benchmarkRoles,
      handler: async (req, res) => {
        res.json(await proposal(db, ProposalBody.parse(req.body)))
      },
    },
    {
      method: 'post',
      path: '/api/benchmarks/proposal.pdf',
      access: benchmarkRoles,
      handler: async (req, res) => {
        const body = ProposalBody.parse(req.body)
        const pdf = await renderProposalPdf(body, await proposal(db, body), { compress: req.query.compress !== 'false' })
        res.setHeader('Content-Type', 'application/pdf')
        res.setHeader('Content-Disposition', `attachment; filename="${proposalFileName(body)}"`)
        res.setHeader('Cache-Control', 'no-store')
        res.send(pdf)
      },
    },
    {
      method: 'post',
      path: '/api/benchmarks/proposal/email',
      access: benchmarkRoles,
      before: [emailLimit],
      handler: async (req, res) => {
        const body = ProposalEmailBody.parse(req.body)
        res.status(202).json(await emailProposal(db, mailer, { id: req.user!.id, name: req.user!.name }, body))
      },
    },
  ]
}
