/**
 * The part of autocannon 8's programmatic API that `scripts/bench/load.ts` uses (the package ships
 * no types). Field names as in autocannon's README, "autocannon(opts[, cb])" and "Results".
 */
declare module 'autocannon' {
  import type { EventEmitter } from 'node:events'

  export interface RequestParams {
    method?: string
    path?: string
    headers?: Record<string, string>
    body?: string | Buffer
  }
  export interface Request extends RequestParams {
    /** Called before each request is built; returns the request to send (falsy: restart the sequence). */
    setupRequest?: (req: RequestParams, context: Record<string, unknown>) => RequestParams | null | undefined
    onResponse?: (status: number, body: string, context: Record<string, unknown>, headers: Record<string, string | string[]>) => void
  }
  export interface Options {
    url: string
    connections?: number
    /** Requests per second per connection (autocannon pauses a connection until the next second). */
    connectionRate?: number
    duration?: number
    pipelining?: number
    timeout?: number
    headers?: Record<string, string>
    requests?: Request[]
    initialContext?: Record<string, unknown>
  }
  export interface Histogram {
    average: number
    mean: number
    stddev: number
    min: number
    max: number
    total: number
    p50: number
    p90: number
    p97_5: number
    p99: number
    [percentile: string]: number
  }
  export interface Result {
    duration: number
    start: Date
    finish: Date
    errors: number
    timeouts: number
    non2xx: number
    resets: number
    mismatches: number
    '2xx': number
    '4xx': number
    '5xx': number
    statusCodeStats: Record<string, { count: number }>
    latency: Histogram & { totalCount: number }
    requests: Histogram & { sent: number }
    throughput: Histogram
  }
  export interface Instance extends EventEmitter, PromiseLike<Result> {
    stop(): void
  }
  function autocannon(opts: Options): Instance
  export default autocannon
}
