import { seedDemoIfEmpty } from '../services/demo/seed'

export default defineNitroPlugin(() => {
  if (!useRuntimeConfig().demoSeed) return
  duringStartup(seedDemoIfEmpty().then(
    (seeded) => {
      if (seeded) console.log('[demo] seeded the demo newsroom')
    },
    error => console.error('[demo] seeding failed:', error),
  ))
})
