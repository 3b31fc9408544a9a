/**
 * Export of a chart as a standalone SVG file or a PNG image. An SVG on the page takes part of its
 * look from the page's CSS; the exported file must not, so the computed presentation styles are
 * written onto each element of a copy before it is serialised. The string helpers are pure (and
 * unit-tested); the DOM and canvas parts run in the browser only.
 */

const SVG_NS = 'http://www.w3.org/2000/svg'

/** Presentation properties copied from the computed style into the exported SVG. */
export const SVG_STYLE_PROPS = [
  'fill',
  'fill-opacity',
  'stroke',
  'stroke-width',
  'stroke-opacity',
  'stroke-dasharray',
  'stroke-linecap',
  'stroke-linejoin',
  'opacity',
  'paint-order',
  'font-family',
  'font-size',
  'font-weight',
  'font-variant-numeric',
  'text-anchor',
  'dominant-baseline',
  'visibility',
] as const

/** Values that are the SVG initial values anyway; left out to keep the file small. */
const INITIAL: Partial<Record<(typeof SVG_STYLE_PROPS)[number], string>> = {
  'fill-opacity': '1',
  'stroke-opacity': '1',
  opacity: '1',
  'stroke-dasharray': 'none',
  'stroke-linecap': 'butt',
  'stroke-linejoin': 'miter',
  'paint-order': 'normal',
  'font-variant-numeric': 'normal',
  'text-anchor': 'start',
  'dominant-baseline': 'auto',
  visibility: 'visible',
}

/** A `style` attribute value from a property reader (e.g. a CSSStyleDeclaration's getPropertyValue). */
export function styleDeclaration(get: (prop: string) => string, props: readonly string[] = SVG_STYLE_PROPS): string {
  const parts: string[] = []
  for (const prop of props) {
    const value = get(prop).trim()
    if (!value || INITIAL[prop as keyof typeof INITIAL] === value) continue
    parts.push(`${prop}:${value.replace(/"/g, "'")}`)
  }
  return parts.join(';')
}

/** The minimal element shape the style walk needs, so it runs on plain objects in tests. */
export interface StyledNode {
  readonly children: ArrayLike<StyledNode>
  getAttribute(name: string): string | null
  setAttribute(name: string, value: string): void
}

/**
 * Writes the computed presentation style of every element of `source` onto the matching element
 * of `target` (a deep clone of it), keeping any inline style already there after the computed one.
 */
export function inlineStyles(source: StyledNode, target: StyledNode, styleOf: (node: StyledNode) => (prop: string) => string): void {
  const decl = styleDeclaration(styleOf(source))
  const own = target.getAttribute('style')
  if (decl || own) target.setAttribute('style', [decl, own].filter(Boolean).join(';'))
  const n = Math.min(source.children.length, target.children.length)
  for (let i = 0; i < n; i++) inlineStyles(source.children[i]!, target.children[i]!, styleOf)
}

/**
 * A standalone SVG document from serialised SVG markup: the SVG namespace, explicit width and
 * height, an opaque background (a transparent chart is unreadable in most viewers), an XML prolog.
 */
export function svgDocument(markup: string, size: { width: number; height: number }, background = '#FFFFFF'): string {
  const open = /^<svg\b[^>]*>/.exec(markup.trim())
  if (!open) throw new RangeError('markup: expected an <svg> element')
  let tag = open[0]
  if (!/\sxmlns=/.test(tag)) tag = tag.replace(/^<svg/, `<svg xmlns="${SVG_NS}"`)
  tag = setAttr(setAttr(tag, 'width', String(Math.round(size.width))), 'height', String(Math.round(size.height)))
  const rest = markup.trim().slice(open[0].length)
  const bg = `<rect width="100%" height="100%" fill="${background}"/>`
  return `<?xml version="1.0" encoding="UTF-8"?>\n${tag}${bg}${rest}`
}

function setAttr(tag: string, name: string, value: string): string {
  const re = new RegExp(`\\s${name}="[^"]*"`)
  return re.test(tag) ? tag.replace(re, ` ${name}="${value}"`) : tag.replace(/>$/, ` ${name}="${value}">`)
}

/** Inserts extra markup (e.g. the circles of a canvas-drawn layer) just before an element's closing tag, found by its `data-export-slot`. */
export function insertIntoSlot(markup: string, slot: string, extra: string): string {
  const re = new RegExp(`(<g[^>]*data-export-slot="${slot}"[^>]*?)(/>|>)`)
  const m = re.exec(markup)
  if (!m) throw new RangeError(`slot: no <g data-export-slot="${slot}"> in the markup`)
  const replacement = m[2] === '/>' ? `${m[1]}>${extra}</g>` : `${m[1]}>${extra}`
  return markup.slice(0, m.index) + replacement + markup.slice(m.index + m[0].length)
}

/** "calibration-scatter-cmax-2026-12-02.svg": a safe file name for an export. */
export function exportFileName(base: string, ext: 'svg' | 'png', now = new Date()): string {
  const slug = base
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .toLowerCase()
    .replace(/[\s_]+/g, '-')
    .replace(/-+/g, '-')
    .slice(0, 60) || 'chart'
  return `${slug}-${now.toISOString().slice(0, 10)}.${ext}`
}

// ---- browser-only below ----

/** The standalone SVG text of an SVG element on the page (computed styles inlined). */
export function serializeSvg(svg: SVGSVGElement, extra?: { slot: string; markup: string }): string {
  const clone = svg.cloneNode(true) as SVGSVGElement
  inlineStyles(svg as unknown as StyledNode, clone as unknown as StyledNode, node => {
    const cs = getComputedStyle(node as unknown as Element)
    return prop => cs.getPropertyValue(prop)
  })
  const rect = svg.getBoundingClientRect()
  const width = Number(svg.getAttribute('width')) || rect.width
  const height = Number(svg.getAttribute('height')) || rect.height
  let markup = new XMLSerializer().serializeToString(clone)
  if (extra) markup = insertIntoSlot(markup, extra.slot, extra.markup)
  return svgDocument(markup, { width, height })
}

/** The SVG text as a data: URL (the app's CSP allows `img-src 'self' data:`, not blob: URLs). */
export function svgDataUrl(svgText: string): string {
  return `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svgText)}`
}

/** A PNG of SVG text at `scale` × its size (2 = sharp on high-density screens and in documents). */
export async function svgToPng(svgText: string, width: number, height: number, scale = 2, overlay?: HTMLCanvasElement): Promise<Blob> {
  const img = new Image()
  img.decoding = 'async'
  await new Promise<void>((resolve, reject) => {
    img.onload = () => resolve()
    img.onerror = () => reject(new Error('The chart could not be drawn as an image.'))
    img.src = svgDataUrl(svgText)
  })
  const canvas = document.createElement('canvas')
  canvas.width = Math.round(width * scale)
  canvas.height = Math.round(height * scale)
  const ctx = canvas.getContext('2d')
  if (!ctx) throw new Error('This browser cannot draw images.')
  ctx.drawImage(img, 0, 0, canvas.width, canvas.height)
  if (overlay) ctx.drawImage(overlay, 0, 0, canvas.width, canvas.height)
  return await new Promise<Blob>((resolve, reject) => canvas.toBlob(b => (b ? resolve(b) : reject(new Error('The image could not be made.'))), 'image/png'))
}

/** What a chart offers for export: SVG text and a PNG. */
export interface ChartExporter {
  svg: () => string
  png: () => Promise<Blob>
}

/** The exporter of a plain SVG chart. */
export function svgExporter(svg: SVGSVGElement): ChartExporter {
  return {
    svg: () => serializeSvg(svg),
    png: () => {
      const w = Number(svg.getAttribute('width')) || svg.getBoundingClientRect().width
      const h = Number(svg.getAttribute('height')) || svg.getBoundingClientRect().height
      return svgToPng(serializeSvg(svg), w, h)
    },
  }
}
