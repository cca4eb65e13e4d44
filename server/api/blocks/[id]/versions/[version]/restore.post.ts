import { versionParamsSchema, versionRestoreSchema } from '#shared/schemas/history'
import { findBlock } from '#server/services/investigations/blocks'
import { restoreVersion } from '#server/services/history/restore'

// Whoever may edit the block may restore one of its versions: a restore is a save.
export default defineEventHandler(async (event) => {
  const { id, version } = readParams(event, versionParamsSchema)
  const input = await readInput(event, versionRestoreSchema)
  const { block, investigation } = await findBlock(id)
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return restoreVersion(actor, block, version, input.version)
})
