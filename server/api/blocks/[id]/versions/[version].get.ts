import { versionParamsSchema } from '#shared/schemas/history'
import { findBlock } from '#server/services/investigations/blocks'
import { blockVersion } from '#server/services/history/versions'

export default defineEventHandler(async (event) => {
  const { id, version } = readParams(event, versionParamsSchema)
  const { block, investigation } = await findBlock(id, { includeRemoved: true })
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return blockVersion(block, version)
})
