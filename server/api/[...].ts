// Any /api address without a route of its own answers 404 in the one error shape, whatever the
// method, instead of falling through to the pages.
export default defineEventHandler(() => {
  throw fail(404)
})
