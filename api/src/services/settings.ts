import { eq } from 'drizzle-orm'
import { FALLBACK_SIZING_DEFAULTS, SizingDefaults } from '@shared/schemas/settings'
import type { Db } from '../db'
import { auditLog, firmSettings } from '../db/schema'
import { sharedRead } from '../db/shared-read'

const SIZING_KEY = 'sizing-defaults'

/** The firm's sizing defaults, or the built-in ones when none were saved (or the saved value no longer parses). */
export function getSizingDefaults(db: Db): Promise<SizingDefaults> {
  return readSizingDefaults(db)
}

// Read on every analytics request: concurrent callers share queries (never one sent before their call).
const readSizingDefaults = sharedRead(async (db: Db): Promise<SizingDefaults> => {
  const [row] = await db.select().from(firmSettings).where(eq(firmSettings.key, SIZING_KEY))
  const parsed = row ? SizingDefaults.safeParse(row.value) : undefined
  return parsed?.success ? parsed.data : FALLBACK_SIZING_DEFAULTS
})

export async function saveSizingDefaults(db: Db, actorId: number, value: SizingDefaults): Promise<SizingDefaults> {
  const before = await getSizingDefaults(db)
  await db.transaction(async tx => {
    await tx
      .insert(firmSettings)
      .values({ key: SIZING_KEY, value, updatedBy: actorId })
      .onConflictDoUpdate({ target: firmSettings.key, set: { value, updatedBy: actorId, updatedAt: new Date() } })
    await tx.insert(auditLog).values({ actorId, action: 'settings.update', entity: 'firm_settings', entityId: SIZING_KEY, detail: { before, after: value } })
  })
  return value
}
