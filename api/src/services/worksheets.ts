import { and, eq } from 'drizzle-orm'
import type { WorksheetKind, WorksheetResponse } from '@shared/schemas/settings'
import type { Db } from '../db'
import { worksheets } from '../db/schema'

export async function getWorksheet(db: Db, userId: number, kind: WorksheetKind): Promise<WorksheetResponse> {
  const [row] = await db.select().from(worksheets).where(and(eq(worksheets.userId, userId), eq(worksheets.kind, kind)))
  return { state: (row?.state as Record<string, unknown> | undefined) ?? null, updatedAt: row?.updatedAt.toISOString() ?? null }
}

export async function saveWorksheet(db: Db, userId: number, kind: WorksheetKind, state: Record<string, unknown>): Promise<WorksheetResponse> {
  const now = new Date()
  await db
    .insert(worksheets)
    .values({ userId, kind, state, updatedAt: now })
    .onConflictDoUpdate({ target: [worksheets.userId, worksheets.kind], set: { state, updatedAt: now } })
  return { state, updatedAt: now.toISOString() }
}
