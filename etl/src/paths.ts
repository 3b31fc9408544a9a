import { readdir, stat } from 'node:fs/promises'
import { join } from 'node:path'

const HISTORY_FILE = /\.(xlsx|csv|arrow|feather|json)$/i

/** Files as given; folders expand to the history files inside them and their subfolders, sorted. */
export async function expandPaths(paths: string[]): Promise<string[]> {
  const out: string[] = []
  for (const p of paths) {
    if ((await stat(p)).isDirectory()) {
      const entries = (await readdir(p, { withFileTypes: true })).filter(e => !e.name.startsWith('.') && !e.name.startsWith('~$'))
      entries.sort((a, b) => a.name.localeCompare(b.name))
      for (const e of entries) {
        if (e.isDirectory()) out.push(...(await expandPaths([join(p, e.name)])))
        else if (HISTORY_FILE.test(e.name)) out.push(join(p, e.name))
      }
    } else out.push(p)
  }
  return out
}
