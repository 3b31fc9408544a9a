/**
 * A look at a zip's central directory before anything is inflated, so a workbook whose parts
 * would expand to hundreds of megabytes (a zip bomb) is refused up front. The sizes are the ones
 * the archive declares; the loader also runs uploads in a process of its own, so an archive that
 * lies about them cannot take the server down with it.
 */

/** Largest total uncompressed size of a workbook's parts. */
export const MAX_UNCOMPRESSED_BYTES = 256 * 1024 * 1024
/** Largest expansion of one part, when it is more than a few megabytes (ordinary XML packs about 10:1). */
export const MAX_PART_RATIO = 200
const RATIO_FLOOR_BYTES = 8 * 1024 * 1024

export interface ZipPart {
  name: string
  compressed: number
  uncompressed: number
}

/** The parts a zip declares, from its central directory; undefined when it has none that can be read. */
export function zipParts(data: Uint8Array): ZipPart[] | undefined {
  const view = new DataView(data.buffer, data.byteOffset, data.byteLength)
  // End of central directory: 22 bytes plus a comment of up to 65,535 bytes, at the very end.
  let eocd = -1
  for (let i = data.length - 22; i >= Math.max(0, data.length - 22 - 65_535); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i
      break
    }
  }
  if (eocd < 0) return undefined
  const count = view.getUint16(eocd + 10, true)
  let at = view.getUint32(eocd + 16, true)
  const parts: ZipPart[] = []
  for (let n = 0; n < count; n++) {
    if (at + 46 > data.length || view.getUint32(at, true) !== 0x02014b50) return undefined
    const compressed = view.getUint32(at + 20, true)
    const uncompressed = view.getUint32(at + 24, true)
    const nameLength = view.getUint16(at + 28, true)
    const extra = view.getUint16(at + 30, true)
    const comment = view.getUint16(at + 32, true)
    const name = new TextDecoder().decode(data.subarray(at + 46, at + 46 + nameLength))
    // 0xFFFFFFFF defers to a zip64 record: sizes of 4 GB or more, never a workbook of ours.
    parts.push({ name, compressed, uncompressed: uncompressed === 0xffffffff ? Number.POSITIVE_INFINITY : uncompressed })
    at += 46 + nameLength + extra + comment
  }
  return parts
}

/** Why a zip must not be inflated, or undefined when it may. */
export function zipBombReason(data: Uint8Array): string | undefined {
  const parts = zipParts(data)
  if (!parts) return undefined // not our call: the workbook reader reports a broken archive itself
  const total = parts.reduce((n, p) => n + p.uncompressed, 0)
  const mb = (n: number) => `${Math.round(n / (1024 * 1024))} MB`
  if (total > MAX_UNCOMPRESSED_BYTES) {
    return `its parts would expand to ${Number.isFinite(total) ? mb(total) : 'over 4 GB'} uncompressed (at most ${mb(MAX_UNCOMPRESSED_BYTES)} is read); split the workbook`
  }
  const bomb = parts.find(p => p.uncompressed > RATIO_FLOOR_BYTES && p.uncompressed > MAX_PART_RATIO * Math.max(1, p.compressed))
  if (bomb) return `its part ${bomb.name} expands ${Math.round(bomb.uncompressed / Math.max(1, bomb.compressed))} times (${mb(bomb.uncompressed)} uncompressed), far beyond any spreadsheet`
  return undefined
}
