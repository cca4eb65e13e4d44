import { seedDemoIfEmpty } from '../services/demo/seed'

export default defineNitroPlugin(async () => {
  if (!useRuntimeConfig().demoSeed) return
  try {
    if (await seedDemoIfEmpty()) console.log('[demo] seeded the demo newsroom')
  }
  catch (error) {
    console.error('[demo] seeding failed:', error)
  }
})
