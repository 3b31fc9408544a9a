import type { InputIssue } from '@shared/engineering/errors'

/** A message shown beside one input: an error (no result) or a warning (unusual but valid). */
export interface FieldMessage {
  status: 'error' | 'warning'
  message: string
}

/** field path → message; the first error wins over any warning for the same field. */
export function toFieldMessageMap(errors: readonly InputIssue[], warnings: readonly InputIssue[]): Record<string, FieldMessage> {
  const map: Record<string, FieldMessage> = {}
  for (const w of warnings) map[w.field] ??= { status: 'warning', message: w.message }
  for (const e of errors) if (map[e.field]?.status !== 'error') map[e.field] = { status: 'error', message: e.message }
  return map
}

const NAMES: Record<string, string> = {
  '': 'Request',
  units: 'Units',
  method: 'Design method',
  configuration: 'Configuration',
  bayWidth: 'Bay width',
  bracedBays: 'Braced bays',
  levels: 'Levels',
  fyscMin: 'Fysc,min',
  capacityBasis: 'Capacity basis',
  'capacityBasis.kind': 'Capacity basis',
  'capacityBasis.ry': 'Ry',
  'capacityBasis.fyscMax': 'Fysc,max',
  'capacityBasis.fysc': 'Coupon Fysc',
  beta: 'β',
  omega: 'ω',
  stiffnessFactor: 'Stiffness factor KF',
  yieldLengthRatio: 'Ly/Lwp',
  coreSteps: 'Core increments',
  stiffnessTolerance: 'Stiffness tolerance',
}
const LEVEL_PARTS: Record<string, string> = { name: 'name', storyHeight: 'story height', storyShear: 'story shear' }

/** A field path as a person would name it: `levels.2.storyHeight` → "Story 3 story height". */
export function fieldLabel(path: string): string {
  if (path in NAMES) return NAMES[path]!
  const level = /^levels\.(\d+)(?:\.(\w+))?$/.exec(path)
  if (level) return `Story ${Number(level[1]) + 1}${level[2] ? ` ${LEVEL_PARTS[level[2]] ?? level[2]}` : ''}`
  const step = /^coreSteps\.(\d+)(?:\.(\w+))?$/.exec(path)
  if (step) return `Core increments, band ${Number(step[1]) + 1}${step[2] === 'upTo' ? ' upper bound' : step[2] === 'step' ? ' step' : ''}`
  return path
}
