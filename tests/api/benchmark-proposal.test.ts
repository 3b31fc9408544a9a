import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { simpleParser } from 'mailparser'
import type { Response } from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { PROPOSAL_EMAILS_PER_HOUR } from '@shared/schemas/benchmarks'
import { auditLog } from '../../api/src/db/schema'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'
import { waitForMail } from '../helpers/mail'
import { pdfText } from '../helpers/pdf-text'

// Eight invented two-story projects on 40 000 ft² (as in benchmarks.test.ts). Office BM-01…BM-06: final
// lateral steel 20, 30, 40, 50, 60, 70 tons → 1.0, 1.5, 2.0, 2.5, 3.0, 3.5 lb/ft²; final structural 200 tons
// (10 lb/ft²). BM-02 and BM-05 are client-confidential. Healthcare BM-07, BM-08.
const PROJECTS = [
  { code: 'BM-01', name: 'Open Office One', client: 'Client Zero One', secret: false, use: 'office', tons: 20 },
  { code: 'BM-02', name: 'Hidden Harbour Tower', client: 'Secret Client Alpha', secret: true, use: 'office', tons: 30 },
  { code: 'BM-03', name: 'Open Office Three', client: 'Client Zero Three', secret: false, use: 'office', tons: 40 },
  { code: 'BM-04', name: 'Open Office Four', client: 'Client Zero Four', secret: false, use: 'office', tons: 50 },
  { code: 'BM-05', name: 'Quiet Vault Offices', client: 'Secret Client Beta', secret: true, use: 'office', tons: 60 },
  { code: 'BM-06', name: 'Open Office Six', client: 'Client Zero Six', secret: false, use: 'office', tons: 70 },
  { code: 'BM-07', name: 'Clinic One', client: 'Client One Zero', secret: false, use: 'healthcare', tons: 80 },
  { code: 'BM-08', name: 'Clinic Two', client: 'Client One One', secret: false, use: 'healthcare', tons: 90 },
]
const PROFILE = { use: 'office', stories: 2, floorArea: 40_000 }

let t: TestApp
let bd: Awaited<ReturnType<typeof signedIn>>
let principal: Awaited<ReturnType<typeof signedIn>>
let engineer: Awaited<ReturnType<typeof signedIn>>

beforeAll(async () => {
  t = await createTestApp()
  await loadHandProjects(
    t.db.db,
    PROJECTS.map(p =>
      handProject(
        p.code,
        { name: p.name, client: p.client, client_confidential: p.secret ? 'yes' : 'no', benchmark_permitted: p.secret ? 'no' : 'yes', building_use: p.use, region: 'Region 1' },
        [
          { stage: 'preliminary', category: 'lateral_total', weight: 40 },
          { stage: 'final', category: 'lateral_total', weight: p.tons },
          { stage: 'final', category: 'structural_total', weight: 200 },
        ],
      ),
    ),
  )
  ;[bd, principal, engineer] = await Promise.all(['bd', 'principal', 'engineer'].map(r => signedIn(t.app, `${r}@example.com`)))
})
afterAll(async () => t.close())

/** supertest's binary parser: the body as a Buffer. */
const binary = (res: Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => cb(null, Buffer.concat(chunks)))
}

function expectNoProjectNamed(text: string) {
  for (const p of PROJECTS) {
    expect(text).not.toContain(p.name)
    expect(text).not.toContain(p.client)
    expect(text).not.toContain(p.code)
  }
}

describe('POST /api/benchmarks/proposal.pdf', () => {
  it('gives business development a PDF with the range worked out by hand, the cautions, and no project or client', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal.pdf?compress=false').set('x-csrf-token', bd.csrf).send(PROFILE).buffer(true).parse(binary).expect(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect(res.headers['content-disposition']).toBe('attachment; filename="tonnage-benchmark-office-2-stories.pdf"')
    const pdf = res.body as Buffer
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-') // ISO 32000-1 §7.5.2 file header
    const text = pdfText(pdf)
    // Group used: office, 1–3 stories, six projects. Type-7 quantiles of [1.0 … 3.5] lb/ft² (h = 5p):
    // P25 h=1.25 → 1.5 + 0.25·0.5 = 1.625; P50 h=2.5 → 2.25; P75 h=3.75 → 2.875.
    // Expected lateral steel for 40 000 ft²: × 40 000 / 2000 lb per ton → 32.5, 45.0, 57.5 tons.
    expect(text).toContain('32.5 tons')
    expect(text).toContain('45.0 tons')
    expect(text).toContain('57.5 tons')
    expect(text).toContain('1.63') // P25 to two decimals
    expect(text).toContain('6 finished past projects')
    // The cautions are on the sheet (the decoder reads text: this check could fail).
    expect(text).toContain('Preliminary design aid')
    expect(text).toContain('engineer of record decides')
    expectNoProjectNamed(text)
  })

  it('compresses by default, and the compressed file names no project either', async () => {
    const res = await principal.agent.post('/api/benchmarks/proposal.pdf').set('x-csrf-token', principal.csrf).send({ ...PROFILE, units: 'si', floorArea: 3716 }).buffer(true).parse(binary).expect(200)
    const pdf = res.body as Buffer
    expect(pdf.subarray(0, 4).toString('latin1')).toBe('%PDF')
    expect(pdf.toString('latin1')).toContain('/FlateDecode')
    const text = pdfText(pdf)
    expect(text).toContain('kg/m²')
    expect(text).toContain('tonnes')
    expectNoProjectNamed(text)
  })

  it('refuses an engineer (benchmarks are for principals and business development)', async () => {
    const res = await engineer.agent.post('/api/benchmarks/proposal.pdf').set('x-csrf-token', engineer.csrf).send(PROFILE).expect(403)
    expect(res.body.error.code).toBe('FORBIDDEN')
  })

  it('answers 400 naming the field for a story count of 0', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal.pdf').set('x-csrf-token', bd.csrf).send({ ...PROFILE, stories: 0 }).expect(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['stories'])
  })
})

describe('POST /api/benchmarks/proposal/email', () => {
  it('mails the PDF as an attachment and audits who sent it to whom', async () => {
    const to = 'client.contact@example.org'
    const after = Date.now()
    const res = await bd.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', bd.csrf).send({ profile: PROFILE, to }).expect(202)
    expect(res.body).toEqual({ to, fileName: 'tonnage-benchmark-office-2-stories.pdf' })
    const mail = await waitForMail(to, { after })
    expect(mail.subject).toMatch(/Steel tonnage benchmark: office, 2 stories/)
    expect(mail.text).toContain('32.5–57.5 tons (median 45.0)')
    expect(mail.text).toMatch(/engineer of record decides/)
    expectNoProjectNamed(mail.text)
    const parsed = await simpleParser(await readFile(join(process.env.MAIL_SINK_DIR!, `${mail.id}.eml`)))
    expect(parsed.attachments).toHaveLength(1)
    const [att] = parsed.attachments
    expect(att!.filename).toBe('tonnage-benchmark-office-2-stories.pdf')
    expect(att!.contentType).toBe('application/pdf')
    expect(att!.content.subarray(0, 4).toString('latin1')).toBe('%PDF')
    expect(pdfText(att!.content)).toContain('45.0 tons')
    expectNoProjectNamed(pdfText(att!.content))

    const audit = await t.db.db.select().from(auditLog).where(eq(auditLog.action, 'benchmark.proposal-email'))
    expect(audit).toHaveLength(1)
    expect(audit[0]!.detail).toMatchObject({ to, profile: { use: 'office', stories: 2, floorArea: 40_000 } })
    expect(audit[0]!.actorId).not.toBeNull()
  })

  it('answers 400 naming the field for an address that is not one', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', bd.csrf).send({ profile: PROFILE, to: 'not-an-address' }).expect(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['to'])
    const nested = await bd.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', bd.csrf).send({ profile: { ...PROFILE, floorArea: -1 }, to: 'a@example.org' }).expect(400)
    expect(Object.keys(nested.body.error.fields)).toEqual(['profile.floorArea'])
  })

  it('refuses an engineer', async () => {
    await engineer.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', engineer.csrf).send({ profile: PROFILE, to: 'a@example.org' }).expect(403)
  })

  it(`limits one user to ${PROPOSAL_EMAILS_PER_HOUR} requests an hour`, async () => {
    // Refused bodies count too, so this sends no mail.
    for (let i = 0; i < PROPOSAL_EMAILS_PER_HOUR; i++) {
      await principal.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', principal.csrf).send({ profile: PROFILE, to: 'bad' }).expect(400)
    }
    const res = await principal.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', principal.csrf).send({ profile: PROFILE, to: 'a@example.org' }).expect(429)
    expect(res.body.error.code).toBe('RATE_LIMITED')
    // Another user is not affected: bd has used 3 of its own.
    await bd.agent.post('/api/benchmarks/proposal/email').set('x-csrf-token', bd.csrf).send({ profile: PROFILE, to: 'bad' }).expect(400)
  })
})
