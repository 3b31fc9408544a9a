/**
 * `npm test`: every gate, against a throwaway PostgreSQL cluster and mail sink on free ports.
 * Gates: typecheck (tsc + vue-tsc) → unit and API tests (vitest) → dashboard build →
 * browser tests (vitest + playwright-core driving Debian's Chromium).
 * Prints a closing `N passed, N failed` line and exits non-zero when any gate failed.
 */
import { spawn } from 'node:child_process'
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { startMailSink } from './fakes/mail-sink'
import { startCluster } from './lib/postgres'
import { freePort } from './lib/ports'

const ROOT = resolve(import.meta.dirname, '..')
const ARTIFACTS = join(ROOT, 'test-artifacts')
const bin = (name: string) => join(ROOT, 'node_modules', '.bin', name)

interface Gate {
  name: string
  cmd: string
  args: string[]
  /** vitest JSON report written by this gate, if any. */
  report?: string
}

// Optional arguments: names of gates to run, and test files (paths) to hand to the vitest gates,
// e.g. `npx tsx scripts/test.ts build browser tests/browser/keyboard.test.ts`.
const args = process.argv.slice(2)
const files = args.filter(a => a.includes('/'))
const only = args.filter(a => !a.includes('/'))
/** The files of `files` a vitest gate runs: browser files to the browser gate, the rest to unit+api. */
const filesFor = (gate: string) => files.filter(f => (gate === 'browser') === f.startsWith('tests/browser/'))

async function main() {
  rmSync(ARTIFACTS, { recursive: true, force: true })
  mkdirSync(ARTIFACTS, { recursive: true })

  const work = mkdtempSync(join(tmpdir(), 'backsight-test-'))
  chmodSync(work, 0o755) // the postgres system user must reach the cluster folder inside
  const pgPort = await freePort()
  console.log(`▸ Throwaway PostgreSQL on 127.0.0.1:${pgPort}`)
  const cluster = startCluster({ dataDir: join(work, 'pgdata'), port: pgPort })
  const sink = await startMailSink({ port: await freePort(), dir: join(work, 'mail') })
  console.log(`▸ Mail sink on 127.0.0.1:${sink.port}`)

  const env = {
    ...process.env,
    NODE_ENV: 'test',
    TEST_PG_ADMIN_URL: cluster.url('postgres'),
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(sink.port),
    MAIL_SINK_DIR: sink.dir,
    TEST_ARTIFACTS: ARTIFACTS,
    TZ: 'UTC',
  }

  const gates: Gate[] = [
    { name: 'typecheck:node', cmd: bin('tsc'), args: ['-p', 'tsconfig.json', '--noEmit'] },
    { name: 'typecheck:dashboard', cmd: bin('vue-tsc'), args: ['-p', 'dashboard/tsconfig.json', '--noEmit'] },
    {
      name: 'unit+api',
      cmd: bin('vitest'),
      args: ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${join(ARTIFACTS, 'unit.json')}`],
      report: join(ARTIFACTS, 'unit.json'),
    },
    { name: 'build', cmd: process.execPath, args: [join(ROOT, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'] },
    {
      name: 'browser',
      cmd: bin('vitest'),
      args: ['run', '-c', 'vitest.browser.config.ts', '--reporter=default', '--reporter=json', `--outputFile.json=${join(ARTIFACTS, 'browser.json')}`],
      report: join(ARTIFACTS, 'browser.json'),
    },
  ]

  const failedGates: string[] = []
  let passed = 0
  let failed = 0
  const started = Date.now()
  try {
    for (const gate of gates) {
      if (only.length && !only.includes(gate.name)) continue
      if (gate.report && files.length) {
        const mine = filesFor(gate.name)
        if (!mine.length) continue
        gate.args = [...gate.args, ...mine]
      }
      const t0 = Date.now()
      console.log(`\n━━ ${gate.name} ━━`)
      // Asynchronous on purpose: the mail sink lives in this process and must keep answering.
      const ok = (await run(gate.cmd, gate.args, env)) === 0
      if (gate.report) {
        if (existsSync(gate.report)) {
          const rep = JSON.parse(readFileSync(gate.report, 'utf8')) as { numPassedTests: number; numFailedTests: number; numTotalTests: number }
          passed += rep.numPassedTests
          failed += rep.numFailedTests
          if (rep.numTotalTests === 0) {
            console.log(`${gate.name}: ran no test`)
            failedGates.push(gate.name)
          }
        } else {
          failed += 1 // the runner died before writing its report
        }
      } else {
        ok ? passed++ : failed++ // a non-test gate counts as one check
      }
      if (!ok) failedGates.push(gate.name)
      console.log(`━━ ${gate.name}: ${ok ? 'ok' : 'FAILED'} in ${((Date.now() - t0) / 1000).toFixed(1)} s`)
    }
  } finally {
    await sink.close()
    cluster.stop()
    rmSync(work, { recursive: true, force: true })
  }

  console.log(`\nnpm test finished in ${((Date.now() - started) / 1000).toFixed(1)} s`)
  if (failedGates.length) console.log(`Failed gates: ${[...new Set(failedGates)].join(', ')}`)
  console.log(`${passed} passed, ${failed} failed`)
  process.exit(failedGates.length || failed ? 1 : 0)
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv): Promise<number | null> {
  return new Promise(resolve => {
    const child = spawn(cmd, args, { cwd: ROOT, env, stdio: 'inherit' })
    child.on('exit', code => resolve(code))
    child.on('error', () => resolve(1))
  })
}

main().catch(err => {
  console.error(err)
  process.exit(1)
})
