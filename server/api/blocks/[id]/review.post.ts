import { idParamsSchema } from '#shared/schemas/auth'
import { reviewDecisionSchema } from '#shared/schemas/investigation'
import { findBlock } from '#server/services/investigations/blocks'
import { decideReview } from '#server/services/investigations/review'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { decision, note, version } = await readInput(event, reviewDecisionSchema)
  const { block, investigation } = await findBlock(id)
  const actor = await requirePermission(event, 'block.review', { newsroomId: investigation.newsroomId })
  return decideReview(actor, block, investigation, decision, note, version)
})
