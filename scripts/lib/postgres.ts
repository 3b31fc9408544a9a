import { execFileSync, spawnSync } from 'node:child_process'
import { chownSync, existsSync, mkdirSync, readdirSync } from 'node:fs'
import { createHash } from 'node:crypto'
import { dirname, join, resolve } from 'node:path'
import pg from 'pg'

/** Helpers to run a private PostgreSQL cluster from Debian's server packages, on 127.0.0.1 only. */

const isRoot = process.getuid?.() === 0

export function findPgBin(): string {
  const root = '/usr/lib/postgresql'
  const versions = existsSync(root)
    ? readdirSync(root)
        .filter(v => existsSync(join(root, v, 'bin', 'initdb')))
        .sort((a, b) => Number(b) - Number(a))
    : []
  if (!versions[0]) throw new Error('PostgreSQL server binaries not found under /usr/lib/postgresql. Install the Debian package "postgresql".')
  return join(root, versions[0], 'bin')
}

/** Runs a server binary, as the postgres system user when we are root (the server refuses root). */
function run(bin: string, args: string[], { quiet = false } = {}) {
  const [cmd, argv] = isRoot ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args]
  const r = spawnSync(cmd, argv, { encoding: 'utf8' })
  if (r.status !== 0 && !quiet) throw new Error(`${bin} ${args.join(' ')} failed:\n${r.stdout}\n${r.stderr}`)
  return r
}

/** True when the postgres user can reach `dir` (every parent must be searchable). */
export function isReachableByPostgres(dir: string): boolean {
  if (!isRoot) return true
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir]).status === 0
}

export interface Cluster {
  dataDir: string
  port: number
  /** postgres://postgres@127.0.0.1:port/<database> */
  url: (database: string) => string
  stop: () => void
}

/** Creates the cluster if `dataDir` is empty, then starts it (or reuses a running one). */
export function startCluster({ dataDir, port }: { dataDir: string; port: number }): Cluster {
  const bin = findPgBin()
  mkdirSync(dirname(dataDir), { recursive: true, mode: 0o755 })
  mkdirSync(dataDir, { recursive: true, mode: 0o700 })
  if (isRoot) {
    const pwUid = Number(execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim())
    const pwGid = Number(execFileSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).trim())
    chownSync(dataDir, pwUid, pwGid)
    if (!isReachableByPostgres(dirname(dataDir))) throw new Error(`The postgres user cannot reach ${dirname(dataDir)}.`)
  }
  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    run(join(bin, 'initdb'), ['-D', dataDir, '-U', 'postgres', '-A', 'trust', '-E', 'UTF8', '--locale=C.UTF-8', '-N'])
  }
  const status = run(join(bin, 'pg_ctl'), ['-D', dataDir, 'status'], { quiet: true })
  if (status.status !== 0) {
    const opts = `-c listen_addresses=127.0.0.1 -p ${port} -k ${dataDir} -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200`
    run(join(bin, 'pg_ctl'), ['-D', dataDir, '-l', join(dataDir, 'server.log'), '-w', '-t', '60', '-o', opts, 'start'])
  }
  return {
    dataDir,
    port,
    url: database => `postgres://postgres@127.0.0.1:${port}/${database}`,
    stop: () => {
      run(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { quiet: true })
    },
  }
}

/** Creates `database` on the server at `adminUrl` when it does not exist yet. */
export async function ensureDatabase(adminUrl: string, database: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl })
  await client.connect()
  try {
    const { rowCount } = await client.query('select 1 from pg_database where datname = $1', [database])
    if (!rowCount) await client.query(`create database "${database.replace(/"/g, '')}"`)
  } finally {
    await client.end()
  }
}

/** Port of the cluster `npm start` runs (PGPORT, default 55432). */
export const appPort = (env = process.env) => Number(env.PGPORT ?? 55432)

/**
 * Where `npm start` keeps its cluster for the checkout at `root`: PGDATA_DIR, else var/pgdata, or —
 * when the checkout sits where the postgres user cannot enter (e.g. under /root) — a folder of its
 * own named after the checkout.
 */
export function appDataDir(root: string): string {
  if (process.env.PGDATA_DIR) return resolve(process.env.PGDATA_DIR)
  if (isReachableByPostgres(root)) return join(root, 'var', 'pgdata')
  const tag = createHash('sha256').update(root).digest('hex').slice(0, 10)
  return `/var/tmp/backsight-${tag}/pgdata`
}
