import ExcelJS from 'exceljs'
import JSZip from 'jszip'
import { tableFromArrays, tableToIPC } from 'apache-arrow'
import { asc } from 'drizzle-orm'
import { TABLES, TABLE_NAMES, type TableName } from '@shared/history/columns'
import type { Db } from '../db'
import { braces, braceSnapshots, frames, levels, projects, suppliers, tonnage } from '../db/history-schema'
import { toSafeCsv } from './csv-safe'

type Cell = string | number | boolean | null
type Row = Record<string, Cell>

/**
 * Stored units are written as per-column units so an export imports back exactly (no ft↔in
 * rounding): the lossless other half of the import format.
 */
const COLUMN_UNITS: Partial<Record<string, string>> = {
  height: 'ft',
  floor_area: 'ft2',
  bay_width: 'in',
  story_height: 'in',
  story_shear: 'kip',
  design_drift: 'in',
  work_point_length: 'in',
  required_strength: 'kip',
  required_core_area: 'in2',
  core_area: 'in2',
  fysc: 'ksi',
  fysc_max: 'ksi',
  weight: 'ton',
}

const header = (name: string) => (COLUMN_UNITS[name] ? `${name} [${COLUMN_UNITS[name]}]` : name)
const columnsOf = (t: TableName) => TABLES[t].map(c => c.name)
const yn = (b: boolean) => (b ? 'yes' : 'no')

/** The whole history as import-format tables, in stored units. */
export async function historyTables(db: Db): Promise<Record<TableName, Row[]>> {
  const sup = await db.select().from(suppliers).orderBy(asc(suppliers.code))
  const supCode = new Map(sup.map(s => [s.id, s.code]))
  const proj = await db.select().from(projects).orderBy(asc(projects.code))
  const codeOf = new Map(proj.map(p => [p.id, p.code]))
  const fr = (await db.select().from(frames).orderBy(asc(frames.id))).filter(f => codeOf.has(f.projectId))
  const frameOf = new Map(fr.map(f => [f.id, f]))
  const lv = (await db.select().from(levels).orderBy(asc(levels.frameId), asc(levels.levelIndex))).filter(l => frameOf.has(l.frameId))
  const levelOf = new Map(lv.map(l => [l.id, l]))
  const br = (await db.select().from(braces).orderBy(asc(braces.id))).filter(b => levelOf.has(b.levelId))
  const braceOf = new Map(br.map(b => [b.id, b]))
  const snaps = (await db.select().from(braceSnapshots).orderBy(asc(braceSnapshots.id))).filter(s => braceOf.has(s.braceId))
  const ton = (await db.select().from(tonnage).orderBy(asc(tonnage.id))).filter(t => codeOf.has(t.projectId))
  const where = (levelId: number) => {
    const l = levelOf.get(levelId)!
    const f = frameOf.get(l.frameId)!
    return { project_code: codeOf.get(f.projectId)!, frame_line: f.frameLine, level: l.name }
  }
  return {
    suppliers: sup.map(s => ({ supplier_code: s.code, display_name: s.displayName, notes: s.notes })),
    projects: proj.map(p => ({
      project_code: p.code,
      name: p.name,
      client: p.client,
      client_confidential: yn(p.clientConfidential),
      benchmark_permitted: yn(p.benchmarkPermitted),
      office: p.office,
      region: p.region,
      building_use: p.buildingUse,
      risk_category: p.riskCategory,
      importance_factor: p.importanceFactor,
      sdc: p.sdc,
      sds: p.sds,
      sd1: p.sd1,
      site_class: p.siteClass,
      stories: p.stories,
      height: p.heightFt,
      floor_area: p.floorAreaFt2,
      asce7_edition: p.asce7Edition,
      aisc341_edition: p.aisc341Edition,
      analysis_method: p.analysisMethod,
      r: p.r,
      cd: p.cd,
      omega0: p.omega0,
      supplier_code: p.supplierId ? (supCode.get(p.supplierId) ?? null) : null,
      year_designed: p.yearDesigned,
      year_completed: p.yearCompleted,
      phase_reached: p.phaseReached,
    })),
    frames: fr.map(f => ({ project_code: codeOf.get(f.projectId)!, frame_line: f.frameLine, configuration: f.configuration, bays: f.bays, bay_width: f.bayWidthIn })),
    levels: lv.map(l => ({ ...where(l.id), level_index: l.levelIndex, story_height: l.storyHeightIn, story_shear: l.storyShearKip, design_drift: l.designDriftIn })),
    braces: br.map(b => ({ ...where(b.levelId), brace_count: b.braceCount, angle_deg: b.angleDeg, work_point_length: b.workPointLengthIn, required_strength: b.requiredStrengthKip, method: b.method })),
    brace_values: snaps.map(s => ({
      ...where(braceOf.get(s.braceId)!.levelId),
      phase: s.phase,
      revision: s.revision,
      date: s.date,
      source_document: s.sourceDocument,
      required_core_area: s.requiredCoreAreaIn2,
      core_area: s.coreAreaIn2,
      fysc: s.fyscKsi,
      fysc_basis: s.fyscBasis,
      fysc_max: s.fyscMaxKsi,
      ry: s.ry,
      beta: s.beta,
      omega: s.omega,
      factor_drift_multiple: s.factorDriftMultiple,
      stiffness_factor: s.stiffnessFactor,
      yield_length_ratio: s.yieldLengthRatio,
      governing: yn(s.governing),
    })),
    tonnage: ton.map(t => ({ project_code: codeOf.get(t.projectId)!, stage: t.stage, category: t.category, weight: t.tons, scope: t.scope })),
  }
}

const ABOUT = { format: 'backsight-history', version: '1', units: 'us' }

async function toWorkbook(tables: Partial<Record<TableName, Row[]>>): Promise<Buffer> {
  const wb = new ExcelJS.Workbook()
  wb.creator = 'Backsight'
  const about = wb.addWorksheet('about')
  about.addRow(['key', 'value'])
  for (const [k, v] of Object.entries(ABOUT)) about.addRow([k, v])
  for (const name of TABLE_NAMES) {
    const ws = wb.addWorksheet(name)
    const cols = columnsOf(name)
    ws.addRow(cols.map(header))
    ws.getRow(1).font = { bold: true }
    for (const row of tables[name] ?? []) ws.addRow(cols.map(c => row[c] ?? null))
  }
  return Buffer.from(await wb.xlsx.writeBuffer())
}

function toCsv(name: TableName, rows: Row[]): string {
  const cols = columnsOf(name)
  return `# units: us\n` + toSafeCsv(cols.map(header), rows.map(r => cols.map(c => r[c] ?? null)))
}

function toArrow(name: TableName, rows: Row[]): Uint8Array {
  const cols = columnsOf(name)
  const data: Record<string, Cell[]> = {}
  for (const c of cols) data[header(c)] = rows.map(r => r[c] ?? null)
  // Every column as text keeps nulls and mixed content simple; the importer parses numbers.
  const table = tableFromArrays(Object.fromEntries(Object.entries(data).map(([k, v]) => [k, v.map(x => (x === null ? null : String(x)))])) as Record<string, string[]>)
  table.schema.metadata.set('table', name)
  table.schema.metadata.set('units', 'us')
  return tableToIPC(table, 'file')
}

export async function exportHistory(db: Db, format: 'xlsx' | 'json' | 'csv' | 'arrow'): Promise<{ name: string; type: string; data: Buffer | string }> {
  const tables = await historyTables(db)
  const stamp = new Date().toISOString().slice(0, 10)
  if (format === 'xlsx') return { name: `backsight-history-${stamp}.xlsx`, type: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', data: await toWorkbook(tables) }
  if (format === 'json') {
    const doc: Record<string, unknown> = { ...ABOUT, version: 1 }
    for (const name of TABLE_NAMES) doc[name] = tables[name].map(r => Object.fromEntries(Object.entries(r).map(([k, v]) => [header(k), v])))
    return { name: `backsight-history-${stamp}.json`, type: 'application/json', data: JSON.stringify(doc, null, 1) }
  }
  const zip = new JSZip()
  for (const name of TABLE_NAMES) {
    if (format === 'csv') zip.file(`${name}.csv`, toCsv(name, tables[name]))
    else zip.file(`${name}.arrow`, toArrow(name, tables[name]))
  }
  return { name: `backsight-history-${stamp}-${format}.zip`, type: 'application/zip', data: await zip.generateAsync({ type: 'nodebuffer' }) }
}

/** An empty workbook with every sheet and header, US units declared. */
export function templateWorkbook(): Promise<Buffer> {
  return toWorkbook({})
}

export function templateCsv(table: string): string {
  return toCsv(table as TableName, [])
}
