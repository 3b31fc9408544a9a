/**
 * `npx tsx scripts/generate-demo-firm.ts [outDir]` (default `demo-data/`): regenerate the invented
 * demo firm's history files from seed 2026 — two XLSX workbooks, a CSV folder, an Arrow file and
 * the README listing the planted faults. Deterministic: the same generator gives the same rows.
 */
import { statSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { generateDemoFirm } from './demo-firm/firm'
import { writeDemoFirm } from './demo-firm/write'

const outDir = process.argv[2] ?? 'demo-data/'
const tables = generateDemoFirm(2026)
const files = await writeDemoFirm(tables, outDir)

const size = (path: string): number => (statSync(path).isDirectory() ? readdirSync(path).reduce((s, f) => s + size(join(path, f)), 0) : statSync(path).size)
for (const file of files) process.stdout.write(`${file.path.padEnd(50)} ${(size(join(outDir, file.path)) / 1024).toFixed(0).padStart(6)} KiB\n`)
process.stdout.write(`${tables.projects.length} projects, ${tables.frames.length} frame lines, ${tables.braces.length} braces, ${tables.brace_values.length} snapshots → ${outDir}\n`)
