import { describe, expect, it } from 'vitest'
import { exportFileName, inlineStyles, insertIntoSlot, styleDeclaration, svgDataUrl, svgDocument, type StyledNode } from '../../../dashboard/src/utils/chart-export'

/** A stand-in element: attributes, children, and the computed style the page would give it. */
class Node implements StyledNode {
  attrs = new Map<string, string>()
  constructor(
    readonly computed: Record<string, string>,
    readonly children: Node[] = [],
  ) {}
  getAttribute(n: string) {
    return this.attrs.get(n) ?? null
  }
  setAttribute(n: string, v: string) {
    this.attrs.set(n, v)
  }
}
const clone = (n: Node): Node => {
  const c = new Node({}, n.children.map(clone))
  for (const [k, v] of n.attrs) c.attrs.set(k, v)
  return c
}

describe('styleDeclaration', () => {
  it('keeps the presentation properties that differ from the SVG initial values', () => {
    const style: Record<string, string> = { fill: 'rgb(31, 86, 102)', stroke: 'none', opacity: '1', 'font-size': '11px', 'text-anchor': 'start', color: 'red' }
    expect(styleDeclaration(p => style[p] ?? '')).toBe('fill:rgb(31, 86, 102);stroke:none;font-size:11px')
  })
  it('turns double quotes into single ones, so the attribute stays well-formed', () => {
    expect(styleDeclaration(p => (p === 'font-family' ? '"Public Sans", system-ui' : ''))).toBe("font-family:'Public Sans', system-ui")
  })
})

describe('inlineStyles', () => {
  it('writes each source element’s computed style onto the matching clone element, keeping its own style after it', () => {
    const text = new Node({ fill: 'rgb(23, 38, 45)', 'font-weight': '600' })
    const line = new Node({ stroke: 'rgb(107, 122, 130)', 'stroke-dasharray': '5px, 4px' })
    line.setAttribute('style', 'stroke-width:2')
    const root = new Node({ 'font-family': 'Public Sans' }, [new Node({}, [text]), line])
    const copy = clone(root)
    inlineStyles(root, copy, n => p => (n as Node).computed[p] ?? '')
    expect(copy.getAttribute('style')).toBe('font-family:Public Sans')
    expect(copy.children[0]!.getAttribute('style')).toBeNull() // nothing to say: no attribute added
    expect(copy.children[0]!.children[0]!.getAttribute('style')).toBe('fill:rgb(23, 38, 45);font-weight:600')
    expect(copy.children[1]!.getAttribute('style')).toBe('stroke:rgb(107, 122, 130);stroke-dasharray:5px, 4px;stroke-width:2')
    // The page's own element is untouched.
    expect(root.children[0]!.children[0]!.getAttribute('style')).toBeNull()
  })
})

describe('svgDocument', () => {
  it('makes a standalone file: prolog, namespace, size and an opaque background', () => {
    const doc = svgDocument('<svg viewBox="0 0 10 5" width="3"><circle r="1"/></svg>', { width: 10.4, height: 5 })
    expect(doc).toBe(
      '<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 10 5" width="10" height="5"><rect width="100%" height="100%" fill="#FFFFFF"/><circle r="1"/></svg>',
    )
  })
  it('keeps a namespace that is already there, and refuses what is not SVG', () => {
    const doc = svgDocument('<svg xmlns="http://www.w3.org/2000/svg"></svg>', { width: 1, height: 1 })
    expect(doc.match(/xmlns=/g)).toHaveLength(1)
    expect(() => svgDocument('<div></div>', { width: 1, height: 1 })).toThrow(RangeError)
  })
})

describe('insertIntoSlot', () => {
  it('puts the extra markup inside the slot group, empty or self-closing', () => {
    expect(insertIntoSlot('<svg><g data-export-slot="points"></g></svg>', 'points', '<circle/>')).toBe('<svg><g data-export-slot="points"><circle/></g></svg>')
    expect(insertIntoSlot('<svg><g class="a" data-export-slot="points"/></svg>', 'points', '<circle/>')).toBe('<svg><g class="a" data-export-slot="points"><circle/></g></svg>')
    expect(() => insertIntoSlot('<svg></svg>', 'points', '')).toThrow(/no <g data-export-slot="points">/)
  })
})

describe('exportFileName', () => {
  it('slugs the base and stamps the date', () => {
    const now = new Date('2026-03-04T05:06:07Z')
    expect(exportFileName('Calibration scatter: Cmax (kip)', 'svg', now)).toBe('calibration-scatter-cmax-kip-2026-03-04.svg')
    expect(exportFileName('ωβ', 'png', now)).toBe('chart-2026-03-04.png')
  })
})

describe('svgDataUrl', () => {
  it('percent-encodes the SVG so any character survives (RFC 2397 data: URL)', () => {
    const url = svgDataUrl('<svg><text>β #1 & "x"</text></svg>')
    expect(url.startsWith('data:image/svg+xml;charset=utf-8,')).toBe(true)
    expect(url).not.toMatch(/[<>#"]/)
    expect(decodeURIComponent(url.slice(url.indexOf(',') + 1))).toBe('<svg><text>β #1 & "x"</text></svg>')
  })
})
