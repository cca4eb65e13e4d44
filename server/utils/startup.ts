const work: Promise<unknown>[] = []

/** Registers work the server must finish before it says it is ready (e.g. seeding the demo). */
export function duringStartup(promise: Promise<unknown>) {
  work.push(promise.catch(() => undefined))
}

/** Resolves once every registered piece of startup work has settled. */
export function startupSettled(): Promise<unknown> {
  return Promise.all(work)
}
