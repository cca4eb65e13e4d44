import { z } from 'zod'
import { uploadDataset } from '#server/services/datasets/upload'

const querySchema = z.object({ newsroomId: z.string().uuid().optional() })

// Multipart: file, title, sourceNote?, sourceUrl?, obtainedOn?, replacesId?. The newsroom is the
// query's newsroomId, or the member's only newsroom. Permission is checked before any byte is stored.
export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { newsroomId } = readQuery(event, querySchema)
  const actor = await requirePermission(event, 'dataset.create', { newsroomId: newsroomId ?? await onlyNewsroomOf(user.id) })
  const result = await uploadDataset(event, actor)
  setResponseStatus(event, result.queued ? 202 : 201)
  return { id: result.id, status: result.status }
})
