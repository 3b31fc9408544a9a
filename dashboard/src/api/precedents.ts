import type { z } from 'zod'
import { PrecedentSearchBody, PrecedentSearchResponse, type PrecedentSearchBody as SearchBody } from '@shared/schemas/precedents'
import { request } from './client'

/** `POST /api/precedents/search` (principal, engineer): the past frames most like the one described. */
export const searchPrecedents = (body: z.input<typeof PrecedentSearchBody> | SearchBody) =>
  request('/api/precedents/search', { method: 'POST', body: PrecedentSearchBody.parse(body), response: PrecedentSearchResponse })
