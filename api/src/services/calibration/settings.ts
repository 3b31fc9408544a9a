import { eq } from 'drizzle-orm'
import { CalibrationSettings, FALLBACK_CALIBRATION_SETTINGS } from '@shared/schemas/calibration'
import type { Db } from '../../db'
import { auditLog, firmSettings } from '../../db/schema'
import { sharedRead } from '../../db/shared-read'

const KEY = 'calibration'

/** The firm's calibration settings (firm_settings key `calibration`), or the built-in ones. */
export function getCalibrationSettings(db: Db): Promise<CalibrationSettings> {
  return readSettings(db)
}

// Read on every analytics request: concurrent callers share queries (never one sent before their call).
const readSettings = sharedRead(async (db: Db): Promise<CalibrationSettings> => {
  const [row] = await db.select().from(firmSettings).where(eq(firmSettings.key, KEY))
  const parsed = row ? CalibrationSettings.safeParse(row.value) : undefined
  return parsed?.success ? parsed.data : FALLBACK_CALIBRATION_SETTINGS
})

/** Saves them with an audit entry (before and after), as the sizing defaults are. */
export async function saveCalibrationSettings(db: Db, actorId: number, value: CalibrationSettings): Promise<CalibrationSettings> {
  const before = await getCalibrationSettings(db)
  await db.transaction(async tx => {
    await tx
      .insert(firmSettings)
      .values({ key: KEY, value, updatedBy: actorId })
      .onConflictDoUpdate({ target: firmSettings.key, set: { value, updatedBy: actorId, updatedAt: new Date() } })
    await tx.insert(auditLog).values({ actorId, action: 'settings.update', entity: 'firm_settings', entityId: KEY, detail: { before, after: value } })
  })
  return value
}
