import { defineStore } from 'pinia'
import { can } from '#shared/auth/permissions'
import type { Action } from '#shared/auth/permissions'
import type { Role } from '#shared/auth/roles'
import type { AnalysisSettings, BlockDTO, ClaimDTO, InvestigationDTO, ProseContent } from '#shared/types/investigation'
import type { ThreadDTO, WithThread } from '#shared/types/conversation'

type Patch = { content?: ProseContent, settings?: AnalysisSettings }
/** `pending`: changed here, not sent yet (typing pauses before a save goes). */
export type SaveState = 'pending' | 'saving' | 'saved' | 'failed'

function withoutKey<T>(record: Record<string, T>, key: string): Record<string, T> {
  return Object.fromEntries(Object.entries(record).filter(([k]) => k !== key))
}

/** True when the block already holds every field of the change. */
function holds(block: BlockDTO, patch: Patch): boolean {
  return (patch.content === undefined || sameJson(block.content, patch.content))
    && (patch.settings === undefined || sameJson(block.settings, patch.settings))
}

export interface Conflict {
  mine: Patch
  theirs: BlockDTO
}

// Chromium refuses a keepalive request whose body passes 64 KiB; a longer block goes as a plain request.
const KEEPALIVE_LIMIT = 60_000

/**
 * The open investigation as the editor holds it: blocks, their save state, conflicts and the
 * blocks removed in this session (for undo). Saves of one block go out one at a time, each
 * against the version the previous one returned, so typing fast never races itself.
 *
 * Refusals are kept by place (`notices`: a block's id, a claim's id, `review:<block id>`), so
 * that each shows beside the action that caused it; `message` is for what has no place.
 */
export const useDocumentStore = defineStore('document', () => {
  const nuxtApp = useNuxtApp()
  const investigation = ref<InvestigationDTO | null>(null)
  const blocks = ref<BlockDTO[]>([])
  const saveState = ref<Record<string, SaveState>>({})
  const conflicts = ref<Record<string, Conflict>>({})
  const removed = ref<BlockDTO[]>([])
  const claims = ref<ClaimDTO[]>([])
  const message = ref('')
  const notices = ref<Record<string, string>>({})
  const viewer = ref<{ role: Role, userId: string } | null>(null)
  /** The block whose editor should take the focus once it is drawn (a block just added). */
  const focusRequest = ref<string | null>(null)
  const queued = new Map<string, Patch>()
  const inFlight = new Set<string>()
  /** What each save on its way carries, until the server answers. */
  const sending = new Map<string, Patch>()
  const timers = new Map<string, ReturnType<typeof setTimeout>>()
  const waiters = new Map<string, (() => void)[]>()

  /** True while anything typed or chosen here has not reached the server. */
  const unsaved = computed(() => Object.values(saveState.value).some(s => s !== 'saved') || Object.keys(conflicts.value).length > 0)

  function load(dto: InvestigationDTO) {
    applyLayout(dto)
    saveState.value = {}
    conflicts.value = {}
    notices.value = {}
    removed.value = []
    // After hydration: the page first shows what the server drew, then the changes it had not yet received.
    if (import.meta.client) nuxtApp.runWithContext(() => onNuxtReady(() => resumeUnsent(dto)))
  }

  // Changes still travelling as the page went (see sendBeforeLeaving) are also kept in the tab's session,
  // in case a request never arrived or the next page was drawn before it did: a block not yet past the
  // version the last of them was sent against gets them again (each holds the whole text or settings,
  // so saving them twice is harmless); a block the server has moved past lets them go.
  const unsentKey = (investigationId: string) => `mantissa:unsent:${investigationId}`
  type Unsent = { blockId: string, lastVersion: number, patch: Patch }

  function keepUnsent(entries: Unsent[]) {
    if (!investigation.value) return
    try {
      sessionStorage.setItem(unsentKey(investigation.value.id), JSON.stringify(entries))
    }
    catch { /* storage full or refused: the keepalive requests still go */ }
  }

  function resumeUnsent(dto: InvestigationDTO) {
    const key = unsentKey(dto.id)
    const stored = sessionStorage.getItem(key)
    sessionStorage.removeItem(key)
    if (!stored) return
    for (const entry of JSON.parse(stored) as Unsent[]) {
      if (dto.blocks.some(b => b.id === entry.blockId && b.version <= entry.lastVersion)) void save(entry.blockId, entry.patch)
    }
  }

  /** Takes the server's list of blocks, keeping what this editor knows about saves and undo. */
  function applyLayout(dto: InvestigationDTO) {
    investigation.value = dto
    // A block with changes not yet on the server keeps them on screen.
    blocks.value = dto.blocks.map(b => (queued.has(b.id) ? { ...b, ...queued.get(b.id) } : b))
    claims.value = dto.claims
  }

  /** What the person reading may do here; the server decides again on every request. */
  function may(action: Action): boolean {
    if (!viewer.value || !investigation.value) return false
    return can(viewer.value.role, action, investigation.value.createdById === viewer.value.userId)
  }

  /** The latest refusal, for a component that shows it beside its own button (useRefusal). */
  const lastRefusal = ref<{ place: string, text: string } | null>(null)

  function notify(place: string, error: unknown) {
    const text = describeApiError(error).message
    notices.value = { ...notices.value, [place]: text }
    lastRefusal.value = { place, text }
  }

  function dismiss(place: string) {
    notices.value = withoutKey(notices.value, place)
  }

  /**
   * Runs a change on the server and shows its answer: `apply` takes what the server answered, and
   * without it the document is read again (changes that reach other blocks, such as a lock). A
   * refusal is kept under `place`; a 409 or 423 means the document moved on, so it is read again.
   */
  async function act<T>(place: string, request: () => Promise<T>, apply?: (answer: T) => void): Promise<boolean> {
    dismiss(place)
    try {
      const answer = await request()
      if (apply) apply(answer)
      else await refreshLayout()
      return true
    }
    catch (error) {
      notify(place, error)
      const status = (error as { statusCode?: number }).statusCode
      if (status === 409 || status === 423) await refreshLayout().catch(() => {})
      return false
    }
  }

  // Typed loosely on purpose: Nitro's route typing over a plain string path is too deep for tsc.
  const send = $fetch as <T = unknown>(url: string, options: { method: 'POST' | 'PATCH' | 'DELETE', body?: object, keepalive?: boolean }) => Promise<T>
  const post = <T>(path: string, body?: object) => () => send<T>(path, { method: 'POST', body })

  function putClaim(claim: ClaimDTO) {
    const index = claims.value.findIndex(c => c.id === claim.id)
    if (index >= 0) claims.value[index] = claim
    else claims.value.push(claim)
  }

  // A claim's id is unique within its investigation only, so every claim route names the investigation too.
  const claimPath = (claimId: string, action = '') => `/api/claims/${claimId}${action}?investigationId=${investigation.value!.id}`

  function markClaim(blockId: string, claimId: string) {
    return act(blockId, post<ClaimDTO>(`/api/investigations/${investigation.value!.id}/claims`, { id: claimId, blockId, supportingBlockIds: [] }), putClaim)
  }
  function citeBlocks(claimId: string, supportingBlockIds: string[]) {
    return act(claimId, () => send<ClaimDTO>(claimPath(claimId), { method: 'PATCH', body: { supportingBlockIds } }), putClaim)
  }
  // Verifying and lifting a lock also lock or free the analysis blocks the claim rests on: read the
  // document again. Verify names the text block's version on screen, so a passage changed since it
  // was read is not locked.
  const verify = (claimId: string) => {
    const blockId = claims.value.find(c => c.id === claimId)?.blockId
    return act(claimId, post(claimPath(claimId, '/verify'), { version: blocks.value.find(b => b.id === blockId)?.version }))
  }
  // A dispute's note and a method sent back are messages of their subject's conversation: the answer carries it as it now is.
  const putThread = (thread: ThreadDTO) => useConversationStore().put(thread)
  const dispute = (claimId: string, note: string) => act(claimId, post<WithThread<ClaimDTO>>(claimPath(claimId, '/dispute'), { note }), ({ thread, ...claim }) => {
    putClaim(claim)
    putThread(thread)
  })
  const unlock = (claimId: string, reason: string) => act(claimId, post(claimPath(claimId, '/unlock'), { reason }))
  const review = (blockId: string, decision: 'approved' | 'sent-back', note?: string) =>
    act(`review:${blockId}`, post<BlockDTO & { thread?: ThreadDTO }>(`/api/blocks/${blockId}/review`, { decision, note, version: blocks.value.find(b => b.id === blockId)?.version }), ({ thread, ...block }) => {
      replace(block)
      if (thread) putThread(thread)
    })
  /** Takes a claim off its passage (the words stay); its block's pending typing is saved first, so the server strips the mark from the latest text. */
  async function removeClaim(claimId: string, reason?: string) {
    const claim = claims.value.find(c => c.id === claimId)
    if (claim) await whenSaved(claim.blockId)
    return act(claimId, () => send(claimPath(claimId), { method: 'DELETE', body: { reason } }))
  }
  /**
   * Renames the investigation and answers '' or the refusal to show. A title saved meanwhile by
   * someone else is taken, and the refusal names both titles.
   */
  async function rename(title: string): Promise<string> {
    const current = investigation.value!
    try {
      const updated = await send<InvestigationDTO>(`/api/investigations/${current.id}`, { method: 'PATCH', body: { title, titleVersion: current.titleVersion } })
      Object.assign(current, { title: updated.title, titleVersion: updated.titleVersion })
      return ''
    }
    catch (e) {
      const theirs = (e as { data?: { data?: { current?: { title: string, titleVersion: number } } } }).data?.data?.current
      if (!theirs) return describeApiError(e).message
      Object.assign(current, theirs)
      return `${describeApiError(e).message} It is now “${theirs.title}”; yours was “${title}”.`
    }
  }
  const requestReview = () => act('review-request', post<InvestigationDTO>(`/api/investigations/${investigation.value!.id}/review-request`), applyLayout)

  /** What the publishing checks depend on: changes when a review or claim changes, not on every keystroke. */
  const checksKey = computed(() => [
    ...blocks.value.map(b => `${b.id}:${b.review?.status ?? ''}:${b.lock ? 'locked' : ''}`),
    ...claims.value.map(c => `${c.id}:${c.status}`),
  ].join('|'))

  function replace(block: BlockDTO) {
    const index = blocks.value.findIndex(b => b.id === block.id)
    if (index >= 0) blocks.value[index] = block
  }

  function isSettled(blockId: string) {
    return !inFlight.has(blockId) && !timers.has(blockId)
      && (!queued.has(blockId) || saveState.value[blockId] === 'failed' || Boolean(conflicts.value[blockId]))
  }

  function settle(blockId: string) {
    if (!isSettled(blockId)) return
    for (const resolve of waiters.get(blockId) ?? []) resolve()
    waiters.delete(blockId)
  }

  function clearTimer(blockId: string) {
    clearTimeout(timers.get(blockId))
    timers.delete(blockId)
  }

  /**
   * Sends the block's queued change. `leaving`: the page is going away, so a change queued behind a
   * save still on its way goes at once, against the version that save will leave.
   */
  async function flush(blockId: string, { leaving = false } = {}) {
    clearTimer(blockId)
    if (inFlight.has(blockId) && !leaving) return
    const patch = queued.get(blockId)
    const block = blocks.value.find(b => b.id === blockId)
    if (!patch || !block) return settle(blockId)
    const version = block.version + (inFlight.has(blockId) ? 1 : 0)
    const body = { version, ...patch }
    queued.delete(blockId)
    inFlight.add(blockId)
    sending.set(blockId, patch)
    saveState.value[blockId] = 'saving'
    try {
      // keepalive: a save under way when the tab closes still reaches the server.
      const keepalive = JSON.stringify(body).length < KEEPALIVE_LIMIT
      const saved = await send(`/api/blocks/${blockId}`, { method: 'PATCH', body, keepalive }) as BlockDTO
      // Changes made while this save travelled stay on screen: the form builds its next change from them.
      const pending = queued.get(blockId)
      replace(pending ? { ...saved, ...pending } : saved)
      saveState.value[blockId] = pending ? 'pending' : 'saved'
      dismiss(blockId)
    }
    catch (error) {
      const e = error as { statusCode?: number, data?: { data?: { current?: BlockDTO } } }
      const current = e.data?.data?.current
      const mine = { ...patch, ...queued.get(blockId) }
      saveState.value[blockId] = 'failed'
      if (e.statusCode === 409 && current && holds(current, mine)) {
        // The server already has exactly this (the same change sent as the page last closed): nothing to choose.
        queued.delete(blockId)
        replace(current)
        saveState.value[blockId] = 'saved'
      }
      else if (e.statusCode === 409 && current) {
        conflicts.value[blockId] = { mine, theirs: current }
        queued.delete(blockId)
      }
      else if (e.statusCode === 423) {
        // Locked while this editor was open: show the lock and the server's text.
        notify(blockId, error)
        queued.delete(blockId)
        await refreshLayout().catch(() => {})
      }
      else {
        // Kept for "Try again" (and for the next change, which sends it along).
        queued.set(blockId, mine)
        notify(blockId, error)
      }
    }
    finally {
      inFlight.delete(blockId)
      sending.delete(blockId)
    }
    if (queued.has(blockId) && saveState.value[blockId] !== 'failed' && !conflicts.value[blockId]) await flush(blockId)
    settle(blockId)
  }

  /**
   * Queues a change of one block and saves it, at once or `after` milliseconds without another
   * change; later changes to the same block replace earlier unsent ones.
   */
  function save(blockId: string, patch: Patch, { after = 0 } = {}) {
    const block = blocks.value.find(b => b.id === blockId)
    if (block) Object.assign(block, patch)
    if (conflicts.value[blockId]) {
      conflicts.value[blockId].mine = { ...conflicts.value[blockId].mine, ...patch }
      return Promise.resolve()
    }
    queued.set(blockId, { ...queued.get(blockId), ...patch })
    if (!inFlight.has(blockId)) saveState.value[blockId] = 'pending'
    clearTimer(blockId)
    if (after > 0) {
      timers.set(blockId, setTimeout(() => flush(blockId), after))
      return Promise.resolve()
    }
    return flush(blockId)
  }

  /** Resolves once every change of the block made so far has reached the server (or failed); sends a waiting one now. */
  function whenSaved(blockId: string): Promise<void> {
    if (timers.has(blockId)) void flush(blockId)
    if (isSettled(blockId)) return Promise.resolve()
    return new Promise(resolve => waiters.set(blockId, [...waiters.get(blockId) ?? [], resolve]))
  }

  /** Sends everything waiting (a failed save once more) and resolves when all of it has landed or failed. */
  async function saveAll() {
    for (const id of queued.keys()) if (saveState.value[id] === 'failed') void flush(id)
    const ids = [...new Set([...queued.keys(), ...inFlight, ...timers.keys()])]
    await Promise.all(ids.map(id => whenSaved(id)))
  }

  /** The page is being hidden or left: everything waiting goes now, as keepalive requests. */
  function sendBeforeLeaving() {
    const travelling = [...new Set([...sending.keys(), ...queued.keys()])].filter(id => !conflicts.value[id])
    keepUnsent(travelling.map(id => ({
      blockId: id, patch: { ...sending.get(id), ...queued.get(id) },
      lastVersion: (blocks.value.find(b => b.id === id)?.version ?? 0) + (inFlight.has(id) && queued.has(id) ? 1 : 0),
    })))
    for (const id of queued.keys()) if (!conflicts.value[id]) void flush(id, { leaving: true })
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
    settle(blockId)
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
    focusRequest.value = block.id
    // As the server did: every later block moves down one place, and the layout has a new version.
    const index = afterBlockId ? blocks.value.findIndex(b => b.id === afterBlockId) + 1 : 0
    for (const later of blocks.value.slice(index)) later.position += 1
    blocks.value.splice(index, 0, block)
    investigation.value.layoutVersion += 1
    return block
  }

  async function remove(blockId: string) {
    const block = blocks.value.find(b => b.id === blockId)
    if (!block) return
    if (await act(blockId, () => send(`/api/blocks/${blockId}`, { method: 'DELETE' }))) removed.value.push(block)
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
    dismiss(blockId)
    try {
      applyLayout(await $fetch<InvestigationDTO>(`/api/investigations/${investigation.value.id}/order`, {
        method: 'POST', body: { layoutVersion: investigation.value.layoutVersion, blockIds: ids },
      }))
    }
    catch (error) {
      notify(blockId, error)
      await refreshLayout()
    }
  }

  return {
    investigation, blocks, claims, saveState, conflicts, removed, message, notices, viewer, focusRequest, unsaved, checksKey, lastRefusal,
    load, save, whenSaved, saveAll, sendBeforeLeaving, retry, takeTheirs, keepMine, insert, remove, undoRemove, move, refreshLayout, may, dismiss,
    markClaim, citeBlocks, verify, dispute, unlock, removeClaim, review, requestReview, rename,
  }
})
