import { CalibrationSettings, FALLBACK_CALIBRATION_SETTINGS } from '@shared/schemas/calibration'
import type { Db } from '../../db'
import { firmSetting } from '../settings'

const calibrationSettings = firmSetting('calibration', CalibrationSettings, FALLBACK_CALIBRATION_SETTINGS)

/** The firm's calibration settings (firm_settings key `calibration`), or the built-in ones. */
export const getCalibrationSettings = (db: Db): Promise<CalibrationSettings> => calibrationSettings.get(db)
/** Saves them with an audit entry (before and after), as the sizing defaults are. */
export const saveCalibrationSettings = (db: Db, actorId: number, value: CalibrationSettings): Promise<CalibrationSettings> => calibrationSettings.save(db, actorId, value)
