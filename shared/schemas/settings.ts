import { z } from 'zod'
import { DESIGN_METHODS, DEFAULT_CORE_STEPS, findStepBandIssues } from '../engineering/core-size'
import { SizingCapacityBasis, SizingCoreStep } from './sizing'

const Positive = z.number().positive()

/**
 * The firm's default sizing basis, the starting point of every New frame worksheet.
 * Stored in US customary units (ksi, in²); the worksheet converts for SI users.
 * Edited by admins and principals.
 */
export const SizingDefaults = z
  .object({
    method: z.enum(DESIGN_METHODS),
    /** Lower-bound core yield stress used for sizing, ksi. */
    fyscMin: Positive.max(150),
    /** Capacity basis for adjusted strengths, stresses in ksi. */
    capacityBasis: SizingCapacityBasis,
    beta: Positive.max(3),
    omega: Positive.max(3),
    stiffnessFactor: Positive.max(5),
    yieldLengthRatio: Positive.max(1),
    /** Core-increment table, in². */
    coreSteps: z.array(SizingCoreStep).min(1).max(20),
    /** Two-sided stiffness tolerance band as a fraction (0.10 = ±10 %). */
    stiffnessTolerance: z.number().min(0).max(0.5),
  })
  .strict()
  .superRefine((d, ctx) => {
    for (const issue of findStepBandIssues(d.coreSteps, 'coreSteps')) {
      ctx.addIssue({ code: 'custom', path: issue.field.split('.').map(p => (/^\d+$/.test(p) ? Number(p) : p)), message: issue.message })
    }
    if (d.capacityBasis.kind === 'yieldRange' && d.capacityBasis.fyscMax < d.fyscMin) {
      ctx.addIssue({ code: 'custom', path: ['capacityBasis', 'fyscMax'], message: 'must be at least the minimum core yield stress.' })
    }
  })
export type SizingDefaults = z.infer<typeof SizingDefaults>

/**
 * Out-of-the-box defaults until a firm sets its own. Each is a common preliminary assumption
 * (common practice, no source; literature ranges in the engineering reference): Fysc,min 38 ksi
 * core plate bought to a 38–46 ksi window, β 1.1, ω 1.4, stiffness factor 1.4, Ly/Lwp 0.6, ±10 % stiffness band.
 */
export const FALLBACK_SIZING_DEFAULTS: SizingDefaults = {
  method: 'lrfd',
  fyscMin: 38,
  capacityBasis: { kind: 'yieldRange', fyscMax: 46 },
  beta: 1.1,
  omega: 1.4,
  stiffnessFactor: 1.4,
  yieldLengthRatio: 0.6,
  coreSteps: DEFAULT_CORE_STEPS.map(b => ({ upTo: b.upToIn2, step: b.stepIn2 })),
  stiffnessTolerance: 0.1,
}

/** Kinds of per-user worksheet the server keeps. */
export const WorksheetKind = z.enum(['new-frame'])
export type WorksheetKind = z.infer<typeof WorksheetKind>

/** A worksheet's saved state: whatever the screen needs to come back as it was (at most 64 KB as JSON). */
export const SaveWorksheetBody = z
  .object({ state: z.record(z.string(), z.unknown()) })
  .strict()
  .refine(b => JSON.stringify(b.state).length <= 65_536, { message: 'The worksheet is larger than 64 KB.', path: ['state'] })
export type SaveWorksheetBody = z.infer<typeof SaveWorksheetBody>

export const WorksheetResponse = z.object({ state: z.record(z.string(), z.unknown()).nullable(), updatedAt: z.string().nullable() })
export type WorksheetResponse = z.infer<typeof WorksheetResponse>
