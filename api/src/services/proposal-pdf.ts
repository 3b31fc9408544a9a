import { existsSync, readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import PDFDocument from 'pdfkit'
import { proposalSheet, type ProposalSheet } from '@shared/benchmarks/proposal-sheet'
import type { ProposalBody, ProposalResponse } from '@shared/schemas/benchmarks'

/**
 * The proposal sheet as a one-page PDF (pdfkit), from the same rows as the printable page and the
 * CSV (`shared/benchmarks/proposal-sheet.ts`). Public Sans is embedded from @fontsource's WOFF files
 * (pdfkit's fontkit reads WOFF); Helvetica when they cannot be found. The sheet names no project and
 * no client: the proposal answer carries none.
 */

const INK = '#17262D'
const MUTED = '#46545B'
const RULE = '#C5CED2'
const BAND = '#E4EFF2'
const CAUTION_BG = '#FBEEDD'
const CAUTION_RULE = '#B5651D'

function fontFiles(): { regular: Buffer; bold: Buffer } | null {
  try {
    const require = createRequire(import.meta.url)
    const dir = join(dirname(require.resolve('@fontsource/public-sans/package.json')), 'files')
    const regular = join(dir, 'public-sans-latin-400-normal.woff')
    const bold = join(dir, 'public-sans-latin-700-normal.woff')
    if (!existsSync(regular) || !existsSync(bold)) return null
    return { regular: readFileSync(regular), bold: readFileSync(bold) }
  } catch {
    return null
  }
}

let fonts: ReturnType<typeof fontFiles> | undefined

export interface PdfOptions {
  /** Deflate the page streams (default true); tests read the text of an uncompressed file. */
  compress?: boolean
  /** Printed in the footer, e.g. the time it was made. */
  generatedAt?: string
}

/** The sheet's file name: `tonnage-benchmark-office-6-stories.pdf`. */
export function proposalFileName(profile: ProposalBody): string {
  return `tonnage-benchmark-${profile.use}-${profile.stories}-stories.pdf`
}

/** The PDF of `profile`'s proposal sheet. */
export function renderProposalPdf(profile: ProposalBody, result: ProposalResponse, options: PdfOptions = {}): Promise<Buffer> {
  return renderSheetPdf(proposalSheet(profile, result), options)
}

export function renderSheetPdf(sheet: ProposalSheet, { compress = true, generatedAt = new Date().toISOString() }: PdfOptions = {}): Promise<Buffer> {
  fonts ??= fontFiles()
  const doc = new PDFDocument({ size: 'LETTER', margin: 54, compress, info: { Title: sheet.title, Creator: 'Backsight', Producer: 'Backsight' } })
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  let regular = 'Helvetica'
  let bold = 'Helvetica-Bold'
  if (fonts) {
    doc.registerFont('PublicSans', fonts.regular)
    doc.registerFont('PublicSans-Bold', fonts.bold)
    regular = 'PublicSans'
    bold = 'PublicSans-Bold'
  }
  const left = doc.page.margins.left
  const width = doc.page.width - left - doc.page.margins.right

  doc.fillColor(MUTED).font(bold).fontSize(9).text('BACKSIGHT', left, 54, { characterSpacing: 1.5 })
  doc.moveDown(0.3)
  doc.fillColor(INK).font(bold).fontSize(18).text(sheet.title)
  doc.moveDown(0.6)

  // The caution first, where nobody can miss it.
  const cautionY = doc.y
  const cautionText = 'Preliminary design aid. Benchmarks come from the firm’s past projects; verify with the supplier’s qualified values and the governing code. The engineer of record decides.'
  doc.font(regular).fontSize(9)
  const cautionH = doc.heightOfString(cautionText, { width: width - 20 }) + 12
  doc.rect(left, cautionY, width, cautionH).fill(CAUTION_BG)
  doc.rect(left, cautionY, 3, cautionH).fill(CAUTION_RULE)
  doc.fillColor(INK).text(cautionText, left + 12, cautionY + 6, { width: width - 20 })
  doc.y = cautionY + cautionH + 14

  section(doc, bold, 'The building')
  for (const p of sheet.profile) pair(doc, regular, bold, p.label, p.value, left, width)
  doc.moveDown(0.6)

  section(doc, bold, 'Benchmark used')
  doc.font(regular).fontSize(10).fillColor(INK).text(sheet.basis, left, doc.y, { width })
  doc.moveDown(0.6)

  if (sheet.expected.length) {
    section(doc, bold, 'Expected steel for this building')
    table(
      doc,
      regular,
      bold,
      ['', 'Low (P25)', 'Median', 'High (P75)'],
      sheet.expected.map(e => [e.label, `${e.low} ${e.unit}`, `${e.median} ${e.unit}`, `${e.high} ${e.unit}`]),
      [0.4, 0.2, 0.2, 0.2],
      left,
      width,
    )
    doc.moveDown(0.6)
  }

  if (sheet.bands.length) {
    section(doc, bold, 'Percentile bands of the group')
    table(
      doc,
      regular,
      bold,
      ['', 'n', 'P10', 'P25', 'Median', 'P75', 'P90'],
      sheet.bands.map(b => [`${b.label} (${b.unit})`, String(b.n), b.p10, b.p25, b.p50, b.p75, b.p90]),
      [0.4, 0.08, 0.104, 0.104, 0.104, 0.104, 0.104],
      left,
      width,
    )
    doc.moveDown(0.6)
  }

  section(doc, bold, 'Cautions')
  doc.font(regular).fontSize(8.5).fillColor(MUTED)
  for (const c of sheet.cautions) {
    doc.text(`•  ${c}`, left, doc.y, { width, paragraphGap: 2 })
  }

  doc.font(regular).fontSize(7.5).fillColor(MUTED).text(`Made by Backsight on ${generatedAt}. Figures describe the firm’s finished projects; no project or client is named.`, left, doc.page.height - 54 - 10, {
    width,
    lineBreak: false,
  })
  doc.end()
  return done
}

function section(doc: PDFKit.PDFDocument, bold: string, title: string) {
  const x = doc.page.margins.left
  doc.font(bold).fontSize(11).fillColor(INK).text(title, x, doc.y)
  const y = doc.y + 2
  doc
    .moveTo(x, y)
    .lineTo(doc.page.width - doc.page.margins.right, y)
    .lineWidth(0.5)
    .strokeColor(RULE)
    .stroke()
  doc.y = y + 6
}

function pair(doc: PDFKit.PDFDocument, regular: string, bold: string, label: string, value: string, left: number, width: number) {
  const y = doc.y
  doc.font(regular).fontSize(10).fillColor(MUTED).text(label, left, y, { width: width * 0.4 })
  doc.font(bold).fillColor(INK).text(value, left + width * 0.4, y, { width: width * 0.6 })
  doc.y = Math.max(doc.y, y + 14)
}

function table(doc: PDFKit.PDFDocument, regular: string, bold: string, head: string[], rows: string[][], shares: number[], left: number, width: number) {
  let at = left
  const xs = shares.map(s => {
    const x = at
    at += s * width
    return x
  })
  const cell = (text: string, i: number, y: number, font: string) =>
    doc
      .font(font)
      .fontSize(9.5)
      .text(text, xs[i]! + 4, y + 4, { width: shares[i]! * width - 8, align: i === 0 ? 'left' : 'right', lineBreak: i === 0 })
  let y = doc.y
  doc.rect(left, y, width, 18).fill(BAND)
  doc.fillColor(INK)
  head.forEach((h, i) => cell(h, i, y, bold))
  y += 18
  for (const r of rows) {
    doc.font(regular).fontSize(9.5)
    const h = Math.max(18, doc.heightOfString(r[0]!, { width: shares[0]! * width - 8 }) + 8)
    doc.fillColor(INK)
    r.forEach((v, i) => cell(v, i, y, i === 0 ? regular : bold))
    y += h
    doc
      .moveTo(left, y)
      .lineTo(left + width, y)
      .lineWidth(0.5)
      .strokeColor(RULE)
      .stroke()
  }
  doc.y = y + 4
}
