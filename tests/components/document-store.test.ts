import { describe, expect, it } from 'vitest'
import { registerEndpoint } from '@nuxt/test-utils/runtime'
import { createError, readBody } from 'h3'
import type { BlockDTO, InvestigationDTO } from '#shared/types/investigation'

const BLOCK = '44444444-4444-4444-8444-444444444444'
const DATASET = '22222222-2222-4222-8222-222222222222'

const block = (version: number, settings: BlockDTO['settings']): BlockDTO => ({
  id: BLOCK, kind: 'analysis', position: 0, version, content: null, settings,
  updatedAt: '2026-12-02T00:00:00.000Z', updatedBy: null, review: null, lock: null,
})

// A slow server that keeps what each save sent, like the real one, at the version it was sent against.
const received: { version: number, settings: BlockDTO['settings'] }[] = []
let stored = block(1, {})
registerEndpoint(`/api/blocks/${BLOCK}`, {
  method: 'PATCH',
  handler: async (event) => {
    const body = await readBody(event)
    received.push(body)
    await new Promise(r => setTimeout(r, 50))
    stored = block(stored.version + 1, body.settings)
    return stored
  },
})

describe('saving an analysis block while the reporter keeps choosing', () => {
  it('keeps every choice made while an earlier save was on its way', async () => {
    const store = useDocumentStore()
    store.load({ id: 'i', title: 'Story', newsroomId: 'n', layoutVersion: 1, blocks: [block(1, {})], claims: [] } as unknown as InvestigationDTO)
    const current = () => store.blocks[0]!.settings ?? {}
    // The settings form builds each change from what the block shows at that moment.
    const first = store.save(BLOCK, { settings: { ...current(), datasetId: DATASET } })
    const second = store.save(BLOCK, { settings: { ...current(), column: 'amount' } })
    await new Promise(r => setTimeout(r, 70))
    // The first save has come back by now; the second is on its way.
    const third = store.save(BLOCK, { settings: { ...current(), test: 'first-digit' } })
    await Promise.all([first, second, third])
    await store.whenSaved(BLOCK)
    expect(current()).toEqual({ datasetId: DATASET, column: 'amount', test: 'first-digit' })
    expect(received.at(-1)!.settings).toEqual({ datasetId: DATASET, column: 'amount', test: 'first-digit' })
    expect(stored.settings).toEqual({ datasetId: DATASET, column: 'amount', test: 'first-digit' })
  })
})

const FLAKY = '55555555-5555-4555-8555-555555555555'
const flakyBodies: unknown[] = []
let failNext = true
registerEndpoint(`/api/blocks/${FLAKY}`, {
  method: 'PATCH',
  handler: async (event) => {
    const body = await readBody(event)
    flakyBodies.push(body)
    if (failNext) {
      failNext = false
      throw createError({ statusCode: 503, statusMessage: 'Service Unavailable' })
    }
    return { ...block(body.version + 1, null), id: FLAKY, kind: 'prose', content: body.content }
  },
})

describe('a save that failed', () => {
  it('is sent again by "Try again", and whenSaved waits for it', async () => {
    const store = useDocumentStore()
    const prose = { ...block(3, null), id: FLAKY, kind: 'prose' as const, content: { type: 'doc' as const, content: [] } }
    store.load({ id: 'i', title: 'Story', newsroomId: 'n', layoutVersion: 1, blocks: [prose], claims: [] } as unknown as InvestigationDTO)
    const content = { type: 'doc' as const, content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Kept for the retry.' }] }] }
    await store.save(FLAKY, { content })
    expect(store.saveState[FLAKY]).toBe('failed')
    expect(store.unsaved).toBe(true)
    await store.retry(FLAKY)
    expect(flakyBodies).toEqual([{ version: 3, content }, { version: 3, content }])
    expect(store.saveState[FLAKY]).toBe('saved')
    expect(store.unsaved).toBe(false)
    expect(store.blocks[0]!.version).toBe(4)
  })
})
