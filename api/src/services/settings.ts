import { eq } from 'drizzle-orm'
import type { z } from 'zod'
import { FALLBACK_SIZING_DEFAULTS, SizingDefaults } from '@shared/schemas/settings'
import type { Db } from '../db'
import { auditLog, firmSettings } from '../db/schema'
import { sharedRead } from '../db/shared-read'

/**
 * One firm-wide setting in `firm_settings` under `key`: read as the saved value, or `fallback` when
 * none was saved (or the saved value no longer parses); saved with an audit entry (before and after).
 */
export function firmSetting<S extends z.ZodType>(key: string, schema: S, fallback: z.infer<S>) {
  type T = z.infer<S>
  // Read on every analytics request: concurrent callers share queries (never one sent before their call).
  const get = sharedRead(async (db: Db): Promise<T> => {
    const [row] = await db.select().from(firmSettings).where(eq(firmSettings.key, key))
    const parsed = row ? schema.safeParse(row.value) : undefined
    return parsed?.success ? (parsed.data as T) : fallback
  })
  async function save(db: Db, actorId: number, value: T): Promise<T> {
    const before = await get(db)
    await db.transaction(async tx => {
      await tx
        .insert(firmSettings)
        .values({ key, value, updatedBy: actorId })
        .onConflictDoUpdate({ target: firmSettings.key, set: { value, updatedBy: actorId, updatedAt: new Date() } })
      await tx.insert(auditLog).values({ actorId, action: 'settings.update', entity: 'firm_settings', entityId: key, detail: { before, after: value } })
    })
    return value
  }
  return { get, save }
}

const sizingDefaults = firmSetting('sizing-defaults', SizingDefaults, FALLBACK_SIZING_DEFAULTS)

/** The firm's sizing defaults, or the built-in ones when none were saved (or the saved value no longer parses). */
export const getSizingDefaults = (db: Db): Promise<SizingDefaults> => sizingDefaults.get(db)
export const saveSizingDefaults = (db: Db, actorId: number, value: SizingDefaults): Promise<SizingDefaults> => sizingDefaults.save(db, actorId, value)
