// Server and browser tests need the app and its PostgreSQL: started here unless one already answers.
import { useTestStack } from '../server/cli/test-stack.mjs'

export default async function setup() {
  const stack = await useTestStack()
  return () => stack.stop()
}
