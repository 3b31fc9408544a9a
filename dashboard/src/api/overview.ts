import { OverviewResponse } from '@shared/schemas/overview'
import { request } from './client'

/** `GET /api/overview`: the landing screen's figures for the signed-in user's role. */
export const getOverview = () => request('/api/overview', { response: OverviewResponse })
