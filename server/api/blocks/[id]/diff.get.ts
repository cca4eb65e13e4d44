import { idParamsSchema } from '#shared/schemas/auth'
import { versionDiffQuerySchema } from '#shared/schemas/history'
import { findBlock } from '#server/services/investigations/blocks'
import { versionDiff } from '#server/services/history/versions'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { from, to } = readQuery(event, versionDiffQuerySchema)
  const { block, investigation } = await findBlock(id, { includeRemoved: true })
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return versionDiff(block, from, to)
})
