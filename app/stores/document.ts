import { defineStore } from 'pinia'
import { can } from '#shared/auth/permissions'
import type { Action } from '#shared/auth/permissions'
import type { Role } from '#shared/auth/roles'
import type { AnalysisSettings, BlockDTO, ClaimDTO, InvestigationDTO, ProseContent } from '#shared/types/investigation'

type Patch = { content?: ProseContent, settings?: AnalysisSettings }
export type SaveState = 'saving' | 'saved' | 'failed'

function withoutKey<T>(record: Record<string, T>, key: string): Record<string, T> {
  return Object.fromEntries(Object.entries(record).filter(([k]) => k !== key))
}

export interface Conflict {
  mine: Patch
  theirs: BlockDTO
}

/**
 * The open investigation as the editor holds it: blocks, their save state, conflicts and the
 * blocks removed in this session (for undo). Saves of one block go out one at a time, each
 * against the version the previous one returned, so typing fast never races itself.
 */
export const useDocumentStore = defineStore('document', () => {
  const investigation = ref<InvestigationDTO | null>(null)
  const blocks = ref<BlockDTO[]>([])
  const saveState = ref<Record<string, SaveState>>({})
  const conflicts = ref<Record<string, Conflict>>({})
  const removed = ref<BlockDTO[]>([])
  const claims = ref<ClaimDTO[]>([])
  const message = ref('')
  const viewer = ref<{ role: Role, userId: string } | null>(null)
  const queued = new Map<string, Patch>()
  const inFlight = new Set<string>()

  function load(dto: InvestigationDTO) {
    applyLayout(dto)
    saveState.value = {}
    conflicts.value = {}
    removed.value = []
  }

  /** Takes the server's list of blocks, keeping what this editor knows about saves and undo. */
  function applyLayout(dto: InvestigationDTO) {
    investigation.value = dto
    blocks.value = dto.blocks
    claims.value = dto.claims
  }

  /** What the person reading may do here; the server decides again on every request. */
  function may(action: Action): boolean {
    if (!viewer.value || !investigation.value) return false
    return can(viewer.value.role, action, investigation.value.createdById === viewer.value.userId)
  }

  /** Runs a change on the server, then shows the document as the server now has it. */
  async function act(request: () => Promise<unknown>): Promise<boolean> {
    try {
      await request()
      await refreshLayout()
      return true
    }
    catch (error) {
      message.value = describeApiError(error).message
      // A 409 means the document moved on: show it as it now is, beside the message.
      if ((error as { statusCode?: number }).statusCode === 409) await refreshLayout().catch(() => {})
      return false
    }
  }

  // Typed loosely on purpose: Nitro's route typing over a plain string path is too deep for tsc.
  const send = $fetch as (url: string, options: { method: 'POST' | 'PATCH' | 'DELETE', body?: object }) => Promise<unknown>
  const post = (path: string, body?: object) => () => send(path, { method: 'POST', body })

  function markClaim(blockId: string, claimId: string) {
    return act(post(`/api/investigations/${investigation.value!.id}/claims`, { id: claimId, blockId, supportingBlockIds: [] }))
  }
  function citeBlocks(claimId: string, supportingBlockIds: string[]) {
    return act(() => send(`/api/claims/${claimId}`, { method: 'PATCH', body: { supportingBlockIds } }))
  }
  const verify = (claimId: string) => act(post(`/api/claims/${claimId}/verify`))
  const dispute = (claimId: string, note: string) => act(post(`/api/claims/${claimId}/dispute`, { note }))
  const unlock = (claimId: string, reason: string) => act(post(`/api/claims/${claimId}/unlock`, { reason }))
  /** Takes a claim off its passage (the words stay); its block's pending typing is saved first, so the server strips the mark from the latest text. */
  async function removeClaim(claimId: string, reason?: string) {
    const claim = claims.value.find(c => c.id === claimId)
    if (claim) await whenSaved(claim.blockId)
    return act(() => send(`/api/claims/${claimId}`, { method: 'DELETE', body: { reason } }))
  }
  const review = (blockId: string, decision: 'approved' | 'sent-back', note?: string) =>
    act(post(`/api/blocks/${blockId}/review`, { decision, note, version: blocks.value.find(b => b.id === blockId)?.version }))
  const requestReview = () => act(post(`/api/investigations/${investigation.value!.id}/review-request`))

  function replace(block: BlockDTO) {
    const index = blocks.value.findIndex(b => b.id === block.id)
    if (index >= 0) blocks.value[index] = block
  }

  async function flush(blockId: string) {
    if (inFlight.has(blockId)) return
    const patch = queued.get(blockId)
    const block = blocks.value.find(b => b.id === blockId)
    if (!patch || !block) return
    queued.delete(blockId)
    inFlight.add(blockId)
    saveState.value[blockId] = 'saving'
    try {
      const saved = await $fetch<BlockDTO>(`/api/blocks/${blockId}`, { method: 'PATCH', body: { version: block.version, ...patch } })
      // Changes made while this save travelled stay on screen: the form builds its next change from them.
      const pending = queued.get(blockId)
      replace(pending ? { ...saved, ...pending } : saved)
      saveState.value[blockId] = 'saved'
    }
    catch (error) {
      const e = error as { statusCode?: number, data?: { data?: { current?: BlockDTO } } }
      const current = e.data?.data?.current
      if (e.statusCode === 409 && current) conflicts.value[blockId] = { mine: { ...patch, ...queued.get(blockId) }, theirs: current }
      else if (e.statusCode === 423) {
        // Locked while this editor was open: show the lock and the server's text.
        message.value = describeApiError(error).message
        queued.delete(blockId)
        await refreshLayout()
      }
      else {
        queued.set(blockId, { ...patch, ...queued.get(blockId) })
        message.value = describeApiError(error).message
      }
      saveState.value[blockId] = 'failed'
      queued.delete(blockId)
    }
    finally {
      inFlight.delete(blockId)
    }
    if (queued.has(blockId) && !conflicts.value[blockId]) await flush(blockId)
  }

  /** Queues a change of one block and saves it; later changes to the same block replace earlier unsent ones. */
  function save(blockId: string, patch: Patch) {
    if (conflicts.value[blockId]) {
      conflicts.value[blockId].mine = { ...conflicts.value[blockId].mine, ...patch }
      return Promise.resolve()
    }
    queued.set(blockId, { ...queued.get(blockId), ...patch })
    const block = blocks.value.find(b => b.id === blockId)
    if (block && patch.settings) block.settings = patch.settings
    return flush(blockId)
  }

  /** Resolves once every change of the block queued so far has reached the server (or failed). */
  async function whenSaved(blockId: string) {
    while (inFlight.has(blockId) || (queued.has(blockId) && !conflicts.value[blockId])) await new Promise(r => setTimeout(r, 50))
  }

  function retry(blockId: string) {
    return flush(blockId)
  }

  /** Keeps the server's version and drops the local change. */
  function takeTheirs(blockId: string) {
    const conflict = conflicts.value[blockId]
    if (!conflict) return
    replace(conflict.theirs)
    conflicts.value = withoutKey(conflicts.value, blockId)
    saveState.value[blockId] = 'saved'
  }

  /** Saves the local change over the server's version, knowingly. */
  async function keepMine(blockId: string) {
    const conflict = conflicts.value[blockId]
    if (!conflict) return
    replace({ ...conflict.theirs })
    conflicts.value = withoutKey(conflicts.value, blockId)
    await save(blockId, conflict.mine)
  }

  async function refreshLayout() {
    if (!investigation.value) return
    applyLayout(await $fetch<InvestigationDTO>(`/api/investigations/${investigation.value.id}`))
  }

  async function insert(kind: 'prose' | 'analysis', afterBlockId: string | null) {
    if (!investigation.value) return
    const block = await $fetch<BlockDTO>(`/api/investigations/${investigation.value.id}/blocks`, { method: 'POST', body: { kind, afterBlockId } })
    await refreshLayout()
    return block
  }

  async function remove(blockId: string) {
    const block = blocks.value.find(b => b.id === blockId)
    if (!block) return
    if (await act(() => send(`/api/blocks/${blockId}`, { method: 'DELETE' }))) removed.value.push(block)
  }

  async function undoRemove() {
    const block = removed.value.pop()
    if (!block) return
    await $fetch(`/api/blocks/${block.id}/restore`, { method: 'POST' })
    await refreshLayout()
  }

  async function move(blockId: string, delta: -1 | 1) {
    if (!investigation.value) return
    const ids = blocks.value.map(b => b.id)
    const from = ids.indexOf(blockId)
    const to = from + delta
    if (from < 0 || to < 0 || to >= ids.length) return
    ids.splice(to, 0, ...ids.splice(from, 1))
    try {
      applyLayout(await $fetch<InvestigationDTO>(`/api/investigations/${investigation.value.id}/order`, {
        method: 'POST', body: { layoutVersion: investigation.value.layoutVersion, blockIds: ids },
      }))
    }
    catch (error) {
      message.value = describeApiError(error).message
      await refreshLayout()
    }
  }

  return {
    investigation, blocks, claims, saveState, conflicts, removed, message, viewer,
    load, save, whenSaved, retry, takeTheirs, keepMine, insert, remove, undoRemove, move, refreshLayout, may,
    markClaim, citeBlocks, verify, dispute, unlock, removeClaim, review, requestReview,
  }
})
