import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { readFileSync } from 'node:fs'
import { eq } from 'drizzle-orm'
import { parse } from 'csv-parse/sync'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { users } from '../../api/src/db/schema'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { waitForMail } from '../helpers/mail'

// A draft from the New frame worksheet example (inverted-V, 3 stories). Its Level 2 braces were sized at
// core 9 in², yield range 38–46 ksi, β 1.1, ω 1.4 (docs/examples/three-story-chevron.json; 9 in² is the
// sizing API's own hand check, see tests/api/drafts.test.ts), so the design Tmax = ω·Fysc,max·Asc =
// 1.4 · 46 · 9 = 579.6 kip and Cmax = β·Tmax = 1.1 · 579.6 = 637.56 kip (AISC 341-16 F4.2a).
const example = JSON.parse(readFileSync('docs/examples/three-story-chevron.json', 'utf8'))
const NAME = 'Mail Check Pavilion'

let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
let code: string

beforeAll(async () => {
  t = await createTestApp()
  // A second active principal (mailed) and an inactive one (not mailed).
  await t.db.db.insert(users).values([
    { email: 'second.principal@example.com', name: 'Second Principal', role: 'principal' },
    { email: 'former.principal@example.com', name: 'Former Principal', role: 'principal', active: false },
  ])
  engineer = await signedIn(t.app, 'engineer@example.com')
  const draft = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: NAME, request: example }).expect(201)
  code = draft.body.code
})
afterAll(async () => t.close())

/** Every captured message about this test's project since `after` (the sink is shared by the whole run). */
async function mailsAbout(after: number) {
  const dir = process.env.MAIL_SINK_DIR!
  const out: { to: string[]; subject: string; text: string }[] = []
  for (const n of (await readdir(dir)).filter(n => n.endsWith('.json'))) {
    const m = JSON.parse(await readFile(join(dir, n), 'utf8'))
    if (Date.parse(m.receivedAt) >= after && String(m.text).includes(NAME)) out.push(m)
  }
  return out
}

const post = (body: object) => engineer.agent.post(`/api/projects/${code}/snapshots`).set('x-csrf-token', engineer.csrf).send({ frameLine: 'A', level: 'Level 2', ...body })

describe('POST /api/projects/:code/snapshots mails an exceeding submittal', () => {
  it('sends nothing for supplier values inside the design, and one mail to the principals and the recorder when they exceed', async () => {
    const t0 = Date.now() - 1000
    // Passing: coupon 42 ksi, core 9 in² → Tmax = 1.4 · 42 · 9 = 529.2 ≤ 579.6; Cmax = 1.1 · 529.2 = 582.12 ≤ 637.56; core +0 %.
    await post({ phase: 'submittal', coreAreaIn2: 9, fyscKsi: 42, fyscBasis: 'coupon', beta: 1.1, omega: 1.4, factorDriftMultiple: 2 }).expect(201)
    // Exceeding: coupon 44 ksi, core 10 in², β 1.15, ω 1.45 → Tmax = 1.45 · 44 · 10 = 638 kip, 58.4 kip over 579.6 (+10.1 %);
    // Cmax = 1.15 · 638 = 733.7 kip, 96.14 kip over 637.56; core 10/9 − 1 = +11.1 %, outside the ±10 % band (firm default).
    const res = await post({ phase: 'submittal', coreAreaIn2: 10, fyscKsi: 44, fyscBasis: 'coupon', beta: 1.15, omega: 1.45, factorDriftMultiple: 2, sourceDocument: 'Submittal 01 rev 1' }).expect(201)
    expect(res.body.snapshot.revision).toBe(1)

    const mail = await waitForMail('principal@example.com', { after: t0 })
    expect(mail.to).toEqual(expect.arrayContaining(['principal@example.com', 'second.principal@example.com', 'engineer@example.com']))
    expect(mail.to).not.toContain('former.principal@example.com')
    expect(mail.to).not.toContain('bd@example.com')
    expect(mail.to).not.toContain('admin@example.com')
    expect(mail.subject).toContain(code)
    expect(mail.subject).toContain('submittal rev. 1')
    expect(mail.text).toContain('Emil Engineer recorded')
    expect(mail.text).toMatch(/Tmax 638\.0 kip exceeds the 579\.6 kip .* by 58\.4 kip/)
    expect(mail.text).toMatch(/Cmax 733\.7 kip exceeds the 637\.6 kip .* by 96\.1 kip/)
    expect(mail.text).toMatch(/Core area \+11\.1 %/)
    expect(mail.text).toContain('engineer of record decides')
    expect(mail.text).toContain(`/projects/${code}?tab=check&phase=submittal&revision=1`)

    // Give a late mail for the passing snapshot time to arrive, then count: exactly one message about this project.
    await new Promise(r => setTimeout(r, 1500))
    const all = await mailsAbout(t0)
    expect(all).toHaveLength(1)
  })

  it('leaves out a principal deactivated since, and names the phase and revision recorded', async () => {
    const t0 = Date.now()
    await t.db.db.update(users).set({ active: false }).where(eq(users.email, 'second.principal@example.com'))
    // Level 3, approved: 2 in² (the engine's minimum core) at a specified minimum 40 ksi with Ry 1.1. Level 3 carries
    // 310 + 170 = 480 kip of the 900 kip base shear, so its design core is well above 2 in²: the core is far outside
    // the ±10 % band on the low side ("exceeds"), while Tmax and Cmax are below the design (pass).
    await post({ level: 'Level 3', phase: 'approved', coreAreaIn2: 2, fyscKsi: 40, fyscBasis: 'specified_min', ry: 1.1, beta: 1.1, omega: 1.4 }).expect(201)
    const mail = await waitForMail('principal@example.com', { after: t0 })
    expect(mail.to).toEqual(expect.arrayContaining(['principal@example.com', 'engineer@example.com']))
    expect(mail.to).not.toContain('second.principal@example.com')
    expect(mail.subject).toContain('approved rev. 0')
    expect(mail.subject).toContain('Level 3')
    expect(mail.text).toMatch(/Core area −\d+\.\d %/)
    expect(mail.text).not.toMatch(/Tmax .* exceeds/)
  })
})

describe('GET /api/projects/:code/submittal-check.csv', () => {
  it('writes one row per check item with the excess, formula-safe, and ends with the cautions', async () => {
    const res = await engineer.agent.get(`/api/projects/${code}/submittal-check.csv?phase=submittal&revision=1`).expect(200)
    expect(res.headers['content-type']).toMatch(/text\/csv/)
    expect(res.headers['content-disposition']).toContain(`${code}-submittal-check-submittal-rev1.csv`)
    const rows = parse(res.text.replace(/^\uFEFF/, ''), { relax_column_count: true }) as string[][]
    expect(rows[0]).toEqual(['project', 'supplier_phase', 'supplier_revision', 'frame_line', 'level', 'design_snapshot', 'brace_status', 'item', 'status', 'design', 'supplier', 'unit', 'excess', 'excess_percent', 'message'])
    const tmax = rows.find(r => r[4] === 'Level 2' && r[7] === 'tmax')!
    // From the hand check above: 638 − 579.6 = 58.4 kip, 638 / 579.6 − 1 = 10.08 %.
    expect(tmax.slice(6, 14)).toEqual(['exceeds', 'tmax', 'exceeds', '579.6', '638', 'kip', '58.4', '10.08'])
    // Level 3 and Roof have no submittal rev 1: one row each saying so.
    expect(rows.filter(r => r[4] === 'Roof')).toHaveLength(1)
    expect(rows.find(r => r[4] === 'Roof')![8]).toBe('missing')
    expect(rows.some(r => r[0]?.startsWith('Tolerance band') && r[0].includes('±10.0 %'))).toBe(true)
    expect(rows.some(r => r[0]?.includes('engineer of record decides'))).toBe(true)
    // No cell begins with a formula character (the messages start with words; signed values are numbers, not text).
    expect(rows.flat().filter(c => typeof c === 'string' && /^[=+@]/.test(c))).toEqual([])
  })

  it('answers 400 naming the field for a bad revision, and 404 for an unknown project', async () => {
    const bad = await engineer.agent.get(`/api/projects/${code}/submittal-check.csv?revision=2`).expect(400)
    expect(bad.body.error.fields).toHaveProperty('phase')
    await engineer.agent.get('/api/projects/NO-SUCH/submittal-check.csv').expect(404)
  })
})
