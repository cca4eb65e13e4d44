/**
 * How many imports this server runs at once. Each holds two database connections and keeps a core
 * busy for its whole length, so more at once finish no sooner: they only crowd out the reporters'
 * questions and, past the pool's size, leave uploads waiting for connections that never come free
 * (seen as SequelizeConnectionAcquireTimeoutError under concurrent uploads).
 */
export const IMPORT_SLOTS = 2

let running = 0
const waiting: (() => void)[] = []

function release() {
  const next = waiting.shift()
  if (next) next()
  else running--
}

/** Waits for a free import slot, at most `waitMs` when given (then null); the returned function gives it back. */
export async function importSlot(): Promise<() => void>
export async function importSlot(waitMs: number): Promise<(() => void) | null>
export async function importSlot(waitMs?: number): Promise<(() => void) | null> {
  if (running < IMPORT_SLOTS) {
    running++
    return once(release)
  }
  let turn!: () => void
  const granted = new Promise<true>((resolve) => {
    turn = () => resolve(true)
    waiting.push(turn)
  })
  const given = waitMs === undefined ? await granted : await Promise.race([granted, new Promise<false>(resolve => setTimeout(resolve, waitMs, false))])
  if (given) return once(release)
  // Timed out: leave the line. A turn handed over in the same tick is passed on.
  const at = waiting.indexOf(turn)
  if (at >= 0) waiting.splice(at, 1)
  else release()
  return null
}

function once(action: () => void): () => void {
  let done = false
  return () => {
    if (done) return
    done = true
    action()
  }
}
