import { tokenParamsSchema } from '#shared/schemas/auth'
import { publicSnapshot } from '#server/services/publishing/public-view'

// The only route a public reader reaches: it reads a frozen snapshot and nothing else.
export default defineEventHandler(async (event) => {
  const { token } = readParams(event, tokenParamsSchema)
  setResponseHeader(event, 'cache-control', 'private, max-age=60')
  return publicSnapshot(token)
})
