import { ConnectionAcquireTimeoutError } from 'sequelize'

/** Seconds a client is asked to wait before trying again when the server is full. */
const RETRY_AFTER_SECONDS = 5

/**
 * A request that waited its whole time for a database connection (every one busy under load)
 * is answered 503 with Retry-After, as a full server should be, not 500: nothing went wrong with
 * the request, and trying again shortly will work.
 */
export default defineNitroPlugin((nitroApp) => {
  const answer = nitroApp.h3App.options.onError
  if (!answer) return
  nitroApp.h3App.options.onError = (error, event) => {
    if (!(error.cause instanceof ConnectionAcquireTimeoutError)) return answer(error, event)
    setResponseHeader(event, 'Retry-After', RETRY_AFTER_SECONDS)
    return answer(fail(503, { message: `Mantissa is answering many requests at once. Nothing was changed; try again in ${RETRY_AFTER_SECONDS} seconds.` }), event)
  }
})
