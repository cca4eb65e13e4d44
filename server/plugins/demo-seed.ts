import { writeFile } from 'node:fs/promises'
import { seedDemoIfEmpty } from '../services/demo/seed'

export default defineNitroPlugin(() => {
  if (!useRuntimeConfig().demoSeed) return
  duringStartup(seedDemoIfEmpty().then(
    async (publicUrl) => {
      if (!publicUrl) return
      // The link's token is stored only as a hash, so the one copy goes where `npm start` can print it.
      const file = process.env.MANTISSA_DEMO_LINK_FILE
      if (file) await writeFile(file, `${publicUrl}\n`).catch(() => {})
      console.log(`[demo] seeded the demo newsroom; its published page: ${publicUrl}`)
    },
    error => console.error('[demo] seeding failed:', error),
  ))
})
