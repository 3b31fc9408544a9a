import { spawn } from 'node:child_process'
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const LOADER = fileURLToPath(new URL('../../../etl/src/cli.ts', import.meta.url))
/**
 * The loader runs at a lower CPU priority (nice 10, coreutils' nice where there is one): on a
 * small server it shares the cores with the API, whose requests should not wait for a batch job.
 */
const NICE = existsSync('/usr/bin/nice') ? ['/usr/bin/nice', '-n', '10'] : []
const ROOT = fileURLToPath(new URL('../../../', import.meta.url))

/**
 * Runs queued imports in a separate loader process each (the ETL command with `--run <id>`), at most
 * `parallel` at a time. Parsing a large or hostile upload then never blocks — or crashes — the server.
 */
export function createImportRunner({ databaseUrl, parallel = 2, env = process.env }: { databaseUrl: string; parallel?: number; env?: NodeJS.ProcessEnv }) {
  const waiting: { runId: number; done: (code: number | null) => void }[] = []
  let active = 0
  const listeners = new Set<(runId: number, code: number | null) => void>()

  function next() {
    while (active < parallel && waiting.length) {
      const job = waiting.shift()!
      active++
      const [command, ...args] = [...NICE, process.execPath, '--import', 'tsx', LOADER, '--run', String(job.runId)]
      const child = spawn(command!, args, {
        cwd: ROOT,
        env: { ...env, DATABASE_URL: databaseUrl },
        stdio: 'ignore',
      })
      const finish = (code: number | null) => {
        active--
        job.done(code)
        for (const l of listeners) l(job.runId, code)
        next()
      }
      child.once('exit', finish)
      child.once('error', () => finish(1))
    }
  }

  return {
    /** Queues a run; the promise settles when its loader process exits. */
    enqueue(runId: number): Promise<number | null> {
      return new Promise(done => {
        waiting.push({ runId, done })
        next()
      })
    },
    onFinished(listener: (runId: number, code: number | null) => void) {
      listeners.add(listener)
    },
  }
}

export type ImportRunner = ReturnType<typeof createImportRunner>
