import { fileURLToPath } from 'node:url'
import { ESLint } from 'eslint'
import { beforeAll, describe, expect, it } from 'vitest'

// The project's lint configuration holds two lines that DEVELOPERS.md describes: the digit engine is
// reached through its index only, and the client's data has one home per resource (composables and
// the document store), so components, pages and layouts never call the API themselves. These checks
// feed the real configuration small files placed where each rule applies, and read which rule fired.
const root = fileURLToPath(new URL('../..', import.meta.url))
let eslint: ESLint

beforeAll(() => {
  eslint = new ESLint({ cwd: root })
}, 60_000)

async function rulesFiredIn(filePath: string, code: string) {
  const [result] = await eslint.lintText(code, { filePath })
  return result!.messages.map(m => m.ruleId)
}

const component = (script: string) => `<script setup lang="ts">\n${script}\n</script>\n\n<template>\n  <p>x</p>\n</template>\n`

describe('the client\'s data layer', () => {
  it.each([
    ['app/components/dataset/DatasetProbe.vue', 'no-restricted-globals', component('const data = await $fetch(\'/api/me\')\nconsole.log(data)')],
    ['app/pages/probe.vue', 'no-restricted-globals', component('const { data } = useFetch(\'/api/me\')\nconsole.log(data)')],
    ['app/layouts/probe.vue', 'no-restricted-globals', component('const fetcher = useRequestFetch()\nconsole.log(fetcher)')],
    ['app/components/app/AppProbe.vue', 'no-restricted-syntax', component('const send = useNuxtApp().$fetch\nconsole.log(send)')],
    ['app/components/app/AppProbe.vue', 'no-restricted-imports', component('import { useAsyncData } from \'#imports\'\n\nconsole.log(useAsyncData)')],
  ])('refuses an API call written in %s (%s)', async (filePath, rule, code) => {
    expect(await rulesFiredIn(filePath, code)).toContain(rule)
  })

  it('lets a composable and a store call the API', async () => {
    const code = 'export function useProbe() {\n  return $fetch(\'/api/me\')\n}\n'
    expect(await rulesFiredIn('app/composables/useProbe.ts', code)).toEqual([])
    expect(await rulesFiredIn('app/stores/probe.ts', code)).toEqual([])
  })
})

describe('the digit engine\'s boundary', () => {
  it('refuses a relative import into shared/digits from outside it, in the server and in a component', async () => {
    const code = 'import { TEST_NAMES } from \'../../shared/digits/types\'\n\nexport const names = TEST_NAMES\n'
    expect(await rulesFiredIn('server/services/probe.ts', code)).toContain('no-restricted-imports')
    expect(await rulesFiredIn('app/components/app/AppProbe.vue', component('import { TEST_NAMES } from \'../../../shared/digits/types\'\n\nconsole.log(TEST_NAMES)'))).toContain('no-restricted-imports')
  })

  it('lets everything else import the index', async () => {
    const code = 'import { TEST_NAMES } from \'#shared/digits\'\n\nexport const names = TEST_NAMES\n'
    expect(await rulesFiredIn('server/services/probe.ts', code)).toEqual([])
  })

  it('refuses anything but its own modules and its two maths packages inside the engine', async () => {
    const code = 'import { ref } from \'vue\'\n\nexport const held = ref(0)\n'
    expect(await rulesFiredIn('shared/digits/probe.ts', code)).toContain('no-restricted-imports')
    expect(await rulesFiredIn('shared/digits/probe.ts', 'import { jStat } from \'jstat\'\n\nexport const mean = jStat.mean\n')).toEqual([])
  })
})
