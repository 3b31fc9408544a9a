import type { z } from 'zod'
import { BenchmarkResponse, ProposalBody, ProposalEmailBody, ProposalEmailSent, ProposalResponse, type BenchmarkQuery } from '@shared/schemas/benchmarks'
import { ApiError, apiErrorFrom, getCsrfToken, request, safeJson } from './client'

/** The Benchmarks endpoints (principal, business development); contract: shared/schemas/benchmarks.ts. */

/** Query string of a benchmark query: lists comma-separated, empty values left out. */
export function benchmarkQueryString(q: Partial<BenchmarkQuery>): string {
  const p = new URLSearchParams()
  for (const [k, v] of Object.entries(q)) {
    if (v === undefined || v === null || (Array.isArray(v) && v.length === 0)) continue
    p.set(k, Array.isArray(v) ? v.join(',') : String(v))
  }
  return p.toString()
}

export const getBenchmarks = (q: Partial<BenchmarkQuery>) => request(`/api/benchmarks?${benchmarkQueryString(q)}`, { response: BenchmarkResponse })

export const getProposal = (body: z.input<typeof ProposalBody>) =>
  request('/api/benchmarks/proposal', { method: 'POST', body: ProposalBody.parse(body), response: ProposalResponse })

export const emailProposal = (body: z.input<typeof ProposalEmailBody>) =>
  request('/api/benchmarks/proposal/email', { method: 'POST', body: ProposalEmailBody.parse(body), response: ProposalEmailSent })

/** The proposal sheet as a PDF made by the server: the file and its name. */
export async function fetchProposalPdf(body: z.input<typeof ProposalBody>): Promise<{ blob: Blob; fileName: string }> {
  const token = await getCsrfToken()
  let res: Response
  try {
    res = await fetch('/api/benchmarks/proposal.pdf', {
      method: 'POST',
      credentials: 'same-origin',
      headers: { 'content-type': 'application/json', accept: 'application/pdf', 'x-csrf-token': token },
      body: JSON.stringify(ProposalBody.parse(body)),
    })
  } catch {
    throw new ApiError(0, 'NETWORK', 'The server could not be reached.')
  }
  if (!res.ok) {
    const text = await res.text()
    throw apiErrorFrom(res.status, text ? safeJson(text) : undefined)
  }
  const name = /filename="([^"]+)"/.exec(res.headers.get('content-disposition') ?? '')?.[1] ?? 'tonnage-benchmark.pdf'
  return { blob: await res.blob(), fileName: name }
}
