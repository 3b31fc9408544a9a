import { AsyncLocalStorage } from 'node:async_hooks'
import type { NextFunction, Request, Response } from 'express'
import onHeaders from 'on-headers'
import { DATA_STALE_HEADER } from '@shared/schemas/freshness'
import type { Db } from '../db'

/*
 * Answers from the previous data version while the next one is built ("catching up").
 *
 * Every answer computed from the whole history (analytics, precedents, benchmarks) is tied to the
 * data version (`calibration_state.version`). After a data change, the structures of the new
 * version take seconds to build on a large history, and every cached answer has to be computed
 * again. Rather than make the requests of those seconds wait, a server with a grace
 * (`ANSWER_GRACE_MS`) answers from the version before, which stays in memory for a while
 * (PREVIOUS_KEPT_MS), and says so in the `Backsight-Data-Stale` header; the dashboard shows that and
 * asks again a moment later. Meanwhile the new version is built in the background (`inBackground`):
 * first its structures (the analytics columns and what derives from them, the precedent history,
 * the benchmark list), then each answer asked for, one job at a time on a quarter of the event loop.
 * A request whose answer is neither held nor quickly computed at either version waits up to the
 * grace for the new one. Without a grace (`ANSWER_GRACE_MS=off`, the default in tests, and services
 * called directly) every answer is of the newest version, waiting if need be.
 *
 * Only ever one version back, and only whole answers: an answer is computed at one version, from
 * that version's structures; one that would query the database itself is never computed for the
 * previous version (READS_DATABASE in store.ts).
 */

/** How long a superseded version's structures and answers stay available as fallbacks. */
export const PREVIOUS_KEPT_MS = 180_000

/**
 * The data version a computation answers for. A computation started for version V reads every
 * structure at exactly V (waiting for it), never a fallback; `fallback` marks a computation for
 * the previous version, which may only use what is still in memory (else NotKept).
 */
interface VersionScope {
  version: number
  fallback: boolean
}
const scopes = new AsyncLocalStorage<VersionScope>()

export const versionScope = (): VersionScope | undefined => scopes.getStore()

/** Runs `fn` as a computation for `version` (see VersionScope). */
export function inVersion<T>(version: number, fallback: boolean, fn: () => T): T {
  return scopes.run({ version, fallback }, fn)
}

/** A fallback computation needed a structure of the previous version that is no longer in memory. */
export class NotKept extends Error {
  constructor(what: string) {
    super(`${what} of the previous data version is no longer in memory`)
    this.name = 'NotKept'
  }
}

const graces = new WeakMap<Db, number>()

/** Sets how long requests on `db` wait for the newest version's answer (null: always wait). */
export function setAnswerGrace(db: Db, ms: number | null): void {
  if (ms === null) graces.delete(db)
  else graces.set(db, ms)
}

interface RequestFreshness {
  /** The oldest version an answer of this request came from, and the newest there is. */
  stale?: { version: number; newest: number }
}
const requests = new AsyncLocalStorage<RequestFreshness>()

/** Middleware: lets the services mark this request's answer as stale (the header goes out with the response). */
export function answerFreshness(_req: Request, res: Response, next: NextFunction): void {
  const ctx: RequestFreshness = {}
  onHeaders(res, () => {
    if (ctx.stale) res.setHeader(DATA_STALE_HEADER, `version=${ctx.stale.version}; newest=${ctx.stale.newest}`)
  })
  requests.run(ctx, next)
}

/** Whether `db` has a grace: its server answers from the previous version while the next is built. */
export const answersMayLag = (db: Db): boolean => graces.has(db)

/** Whether this request on `db` may be answered from the previous version (not inside a computation). */
export const mayAnswerStale = (db: Db): boolean => graces.has(db) && !scopes.getStore()

/** Marks the current request's answer as coming from `version` while `newest` is the newest. */
export function noteStale(version: number, newest: number): void {
  const ctx = requests.getStore()
  if (!ctx) return
  if (!ctx.stale || version < ctx.stale.version) ctx.stale = { version, newest: Math.max(newest, ctx.stale?.newest ?? newest) }
}

/**
 * `fresh` (the newest version's answer) if it settles within the grace, else `recent()` (the same
 * answer at `recentVersion`), marking the request stale. Inside a computation (a version scope), or
 * without a grace, always `fresh`; so too when the recent answer turns out not
 * to be in memory any more (NotKept).
 */
export async function freshOrRecent<T>(db: Db, fresh: Promise<T>, recent: () => Promise<T>, recentVersion: number, newest: number): Promise<T> {
  const grace = graces.get(db)
  if (grace === undefined || scopes.getStore()) return fresh
  let timer: NodeJS.Timeout | undefined
  const late = new Promise<'late'>(resolve => {
    timer = setTimeout(resolve, grace, 'late')
  })
  const first = await Promise.race([fresh.then(() => 'fresh' as const, () => 'fresh' as const), late])
  clearTimeout(timer)
  if (first === 'fresh') return fresh
  try {
    const value = await recent()
    noteStale(recentVersion, newest)
    return value
  } catch (err) {
    if (err instanceof NotKept) return fresh
    throw err
  }
}

/**
 * The share of the event loop that work in the background (catching up after a data change) may
 * take: after each step it pauses for the rest. A paced server already spends about two fifths of
 * its time on requests, so a quarter leaves room for them.
 */
export const BACKGROUND_SHARE = 0.25
/** Longest stretch of catching-up work (a merge of the columns) before the requests waiting meanwhile are let in. */
export const SLICE_MS = 25

/**
 * For a long loop of catching-up work: `await due()` at its checkpoints lets the requests waiting
 * meanwhile in, once SLICE_MS have passed since the last time (otherwise it returns at once).
 */
export function sliceClock(): () => Promise<void> | undefined {
  let start = performance.now()
  return () => {
    if (performance.now() - start < SLICE_MS) return undefined
    return new Promise<void>(resolve =>
      setImmediate(() => {
        start = performance.now()
        resolve()
      }),
    )
  }
}
export const pauseAfter = (busyMs: number) => new Promise(resolve => setTimeout(resolve, (busyMs * (1 - BACKGROUND_SHARE)) / BACKGROUND_SHARE))

interface BackgroundJob {
  id: string
  /** Still worth doing (checked when its turn comes). */
  wanted: () => boolean
  run: () => Promise<unknown>
}
interface BackgroundQueue {
  /** Structures the answers are computed from: first. */
  builds: BackgroundJob[]
  answers: BackgroundJob[]
  ids: Set<string>
  running: boolean
}
const backgroundQueues = new WeakMap<Db, BackgroundQueue>()

/**
 * Runs `run` in the background, one such job at a time per database and each followed by a pause
 * (BACKGROUND_SHARE), so that catching up after a data change leaves most of the event loop to the
 * requests meanwhile, which are answered at their usual pace. Builds of structures go before
 * answers. A job already queued under `id` is not queued twice; a job no longer `wanted` when its
 * turn comes is skipped; a failure is dropped (the next request for that answer starts it again).
 */
export function inBackground(db: Db, id: string, kind: 'build' | 'answer', wanted: () => boolean, run: () => Promise<unknown>): void {
  let q = backgroundQueues.get(db)
  if (!q) backgroundQueues.set(db, (q = { builds: [], answers: [], ids: new Set(), running: false }))
  if (q.ids.has(id)) return
  q.ids.add(id)
  ;(kind === 'build' ? q.builds : q.answers).push({ id, wanted, run })
  if (q.running) return
  q.running = true
  const queue = q
  // Outside the request and computation that queued the first job: the jobs belong to neither.
  void requests.exit(() =>
    scopes.exit(async () => {
      for (let job = queue.builds.shift() ?? queue.answers.shift(); job; job = queue.builds.shift() ?? queue.answers.shift()) {
        queue.ids.delete(job.id)
        if (!job.wanted()) continue
        const t0 = performance.now()
        await job.run().catch(() => {})
        await pauseAfter(performance.now() - t0)
      }
      queue.running = false
    }),
  )
}
