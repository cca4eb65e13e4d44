import { z } from './zod'
import { auditQuerySchema } from './investigation'

const versionNumber = z.coerce.number().int().positive().max(2_147_483_647)

export const versionParamsSchema = z.object({ id: z.string().uuid(), version: versionNumber })

/** Two versions of one block, in either order. */
export const versionDiffQuerySchema = z.object({ from: versionNumber, to: versionNumber })

/** A restore names the block's version the person saw, like any save; a stale one answers 409. */
export const versionRestoreSchema = z.object({ version: z.number().int().positive() })

/** The audit trail's filters without its paging: a download holds every event they match. */
export const auditDownloadSchema = auditQuerySchema.pick({ actor: true, kind: true })
