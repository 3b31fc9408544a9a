import { inflateSync } from 'node:zlib'

/**
 * The text shown by a PDF made by pdfkit, for tests: reads every `TJ`/`Tj` text run and maps its
 * glyph codes back to characters through the font's ToUnicode CMap (PDF 1.7, ISO 32000-1 §9.10.3),
 * following `Tf` font switches. Enough for pdfkit's own output (embedded fonts with `bfrange`
 * arrays / `bfchar`, or standard fonts as WinAnsi hex strings); not a general PDF parser.
 * Compressed (FlateDecode) streams are inflated first. Returns one string per text run.
 */
export function pdfTextRuns(pdf: Buffer): string[] {
  const raw = pdf.toString('latin1')
  const objects = new Map<number, { dict: string; stream: string | null }>()
  const objRe = /(\d+) 0 obj\s*([\s\S]*?)endobj/g
  for (let m = objRe.exec(raw); m; m = objRe.exec(raw)) {
    const body = m[2]!
    const s = /stream\r?\n([\s\S]*?)\r?\nendstream/.exec(body)
    const dict = s ? body.slice(0, s.index) : body
    let stream: string | null = null
    if (s) {
      const bytes = Buffer.from(s[1]!, 'latin1')
      stream = /\/FlateDecode/.test(dict) ? inflateSync(bytes).toString('latin1') : s[1]!
    }
    objects.set(Number(m[1]), { dict, stream })
  }
  // Font resource name (/F1) → object number, from every page's resources.
  const fontByName = new Map<string, number>()
  for (const { dict } of objects.values()) {
    const f = /\/Font\s*<<([\s\S]*?)>>/.exec(dict)
    if (f) for (const e of f[1]!.matchAll(/\/(\w+)\s+(\d+) 0 R/g)) fontByName.set(e[1]!, Number(e[2]))
  }
  const cmapOf = new Map<number, Map<number, string> | null>()
  const cmapFor = (fontObj: number): Map<number, string> | null => {
    if (cmapOf.has(fontObj)) return cmapOf.get(fontObj)!
    const ref = /\/ToUnicode\s+(\d+) 0 R/.exec(objects.get(fontObj)?.dict ?? '')
    const stream = ref ? objects.get(Number(ref[1]))?.stream : null
    const map = stream ? parseCmap(stream) : null
    cmapOf.set(fontObj, map)
    return map
  }
  const runs: string[] = []
  for (const { stream } of objects.values()) {
    if (!stream || !/\bT[Jj]\b/.test(stream)) continue
    let cmap: Map<number, string> | null = null
    const tokenRe = /\/(\w+)\s+[\d.]+\s+Tf|\[((?:[^\]\\]|\\.)*)\]\s*TJ|<([0-9a-fA-F\s]*)>\s*Tj/g
    for (let t = tokenRe.exec(stream); t; t = tokenRe.exec(stream)) {
      if (t[1]) {
        const obj = fontByName.get(t[1])
        cmap = obj === undefined ? null : cmapFor(obj)
        continue
      }
      const hexes = t[2] !== undefined ? [...t[2].matchAll(/<([0-9a-fA-F\s]*)>/g)].map(h => h[1]!) : [t[3]!]
      runs.push(hexes.map(h => decodeHex(h.replace(/\s+/g, ''), cmap)).join(''))
    }
  }
  return runs
}

/** All of a PDF's text runs joined by newlines. */
export function pdfText(pdf: Buffer): string {
  return pdfTextRuns(pdf).join('\n')
}

function decodeHex(hex: string, cmap: Map<number, string> | null): string {
  if (!cmap) return Buffer.from(hex, 'hex').toString('latin1')
  let out = ''
  for (let i = 0; i + 4 <= hex.length; i += 4) out += cmap.get(parseInt(hex.slice(i, i + 4), 16)) ?? '\uFFFD'
  return out
}

const utf16 = (hex: string) => Buffer.from(hex, 'hex').swap16().toString('utf16le')

function parseCmap(text: string): Map<number, string> {
  const map = new Map<number, string>()
  for (const block of text.matchAll(/beginbfrange([\s\S]*?)endbfrange/g)) {
    for (const line of block[1]!.matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F]+)>\s*(\[[^\]]*\]|<[0-9a-fA-F]+>)/g)) {
      const lo = parseInt(line[1]!, 16)
      const hi = parseInt(line[2]!, 16)
      const dst = line[3]!
      if (dst.startsWith('[')) {
        // An entry may hold several UTF-16 units, space-separated (pdfkit writes ligatures as <0066 0069>).
        const items = [...dst.matchAll(/<([0-9a-fA-F\s]+)>/g)].map(x => x[1]!.replace(/\s+/g, ''))
        items.forEach((u, i) => map.set(lo + i, utf16(u)))
      } else {
        const start = parseInt(dst.slice(1, -1), 16)
        for (let c = lo; c <= hi; c++) map.set(c, String.fromCharCode(start + (c - lo)))
      }
    }
  }
  for (const block of text.matchAll(/beginbfchar([\s\S]*?)endbfchar/g)) {
    for (const line of block[1]!.matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F]+)>/g)) map.set(parseInt(line[1]!, 16), utf16(line[2]!))
  }
  return map
}
