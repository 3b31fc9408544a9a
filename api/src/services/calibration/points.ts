import { Dictionary, Float64, Int32, Table, Utf8, makeData, makeVector, tableToIPC } from 'apache-arrow'
import type { CalibrationPoint, CalibrationPoints } from '@shared/schemas/calibration'
import type { PointRows } from './derived'

/** The points as the JSON answer (CalibrationPoints). */
export function pointsJson(p: PointRows): CalibrationPoints {
  const d = p.data
  const col = d.q[p.quantity]
  const points: CalibrationPoint[] = new Array(p.rows.length)
  for (let k = 0; k < p.rows.length; k++) {
    const r = p.rows[k]!
    const pi = d.project[r]!
    points[k] = {
      braceId: d.braceId[r]!,
      projectCode: d.projects.code[pi]!,
      projectName: d.projects.name[pi]!,
      frameLine: d.frameLine.values[d.frameLine.codes[r]!]!,
      level: d.level.values[d.level.codes[r]!]!,
      group: p.groups[p.group[k]!]!,
      basis: col.bases[col.basis[r]!]!,
      assumed: col.assumed[r]!,
      final: col.final[r]!,
    }
  }
  return { quantity: p.quantity, points }
}

/**
 * Re-codes a column to a compact dictionary of the values these points use (numbered in order of
 * first appearance). `source[k]` is point k's code in the column's own dictionary of `size` values.
 */
function dictionary(n: number, size: number, source: Int32Array, valueOf: (code: number) => string) {
  const remap = new Int32Array(size).fill(-1)
  const values: string[] = []
  const codes = new Int32Array(n)
  for (let k = 0; k < n; k++) {
    const c = source[k]!
    let m = remap[c]!
    if (m < 0) {
      m = remap[c] = values.length
      values.push(valueOf(c))
    }
    codes[k] = m
  }
  const type = new Dictionary(new Utf8(), new Int32())
  return makeVector(makeData({ type, length: n, nullCount: 0, data: codes, dictionary: utf8Vector(values) }))
}

const utf8 = new TextEncoder()

/**
 * A Utf8 vector of `values`, laid out directly (offsets and UTF-8 bytes): apache-arrow's
 * vectorFromArray goes through a builder value by value, several times slower for the thousands of
 * project codes and names of a point set.
 */
function utf8Vector(values: string[]) {
  const bytes = values.map(v => utf8.encode(v))
  const valueOffsets = new Int32Array(values.length + 1)
  for (let i = 0; i < bytes.length; i++) valueOffsets[i + 1] = valueOffsets[i]! + bytes[i]!.length
  const data = new Uint8Array(valueOffsets[values.length]!)
  for (let i = 0; i < bytes.length; i++) data.set(bytes[i]!, valueOffsets[i]!)
  return makeVector(makeData({ type: new Utf8(), length: values.length, nullCount: 0, valueOffsets, data }))
}

/**
 * The same points as an Arrow IPC stream: the columns of CalibrationPoint (braceId Int32,
 * assumed/final Float64, string columns dictionary-encoded) and the quantity in the schema
 * metadata (`quantity`).
 */
export function pointsArrow(p: PointRows): Uint8Array {
  const d = p.data
  const col = d.q[p.quantity]
  const n = p.rows.length
  const rows = p.rows
  const braceId = new Int32Array(n)
  const assumed = new Float64Array(n)
  const final = new Float64Array(n)
  const project = new Int32Array(n)
  const frameLine = new Int32Array(n)
  const level = new Int32Array(n)
  const basis = new Int32Array(n)
  for (let k = 0; k < n; k++) {
    const r = rows[k]!
    braceId[k] = d.braceId[r]!
    assumed[k] = col.assumed[r]!
    final[k] = col.final[r]!
    project[k] = d.project[r]!
    frameLine[k] = d.frameLine.codes[r]!
    level[k] = d.level.codes[r]!
    basis[k] = col.basis[r]!
  }
  const table = new Table({
    braceId: makeVector(makeData({ type: new Int32(), length: n, nullCount: 0, data: braceId })),
    projectCode: dictionary(n, d.projects.code.length, project, c => d.projects.code[c]!),
    projectName: dictionary(n, d.projects.name.length, project, c => d.projects.name[c]!),
    frameLine: dictionary(n, d.frameLine.values.length, frameLine, c => d.frameLine.values[c]!),
    level: dictionary(n, d.level.values.length, level, c => d.level.values[c]!),
    group: dictionary(n, p.groups.length, p.group, c => p.groups[c]!),
    basis: dictionary(n, col.bases.length, basis, c => col.bases[c]!),
    assumed: makeVector(makeData({ type: new Float64(), length: n, nullCount: 0, data: assumed })),
    final: makeVector(makeData({ type: new Float64(), length: n, nullCount: 0, data: final })),
  })
  table.schema.metadata.set('quantity', p.quantity)
  return tableToIPC(table, 'stream')
}
