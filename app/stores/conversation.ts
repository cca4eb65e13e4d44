import { defineStore } from 'pinia'
import type { ConversationDTO, MessagePart, ThreadDTO, ThreadSubjectType } from '#shared/types/conversation'
import { subjectAnchor } from '#shared/conversation/anchor'

/**
 * The conversations of the open investigation: its threads, who may be mentioned, which threads
 * are open on screen, and the subject the address points at (its '#' part: a block, a review or a
 * claim), which the page scrolls to and highlights.
 */
export const useConversationStore = defineStore('conversation', () => {
  const investigationId = ref<string | null>(null)
  const threads = ref<ThreadDTO[]>([])
  const members = ref<ConversationDTO['members']>([])
  /** Threads drawn open, by subjectAnchor(). */
  const open = ref<Record<string, boolean>>({})
  const target = ref<{ type: ThreadSubjectType, id: string } | null>(null)

  // `open` is kept across loads: its keys name subjects by id, so another investigation's never match here.
  function load(id: string, dto: ConversationDTO) {
    investigationId.value = id
    threads.value = dto.threads
    members.value = dto.members
  }

  function put(thread: ThreadDTO) {
    const index = threads.value.findIndex(t => t.id === thread.id)
    if (index >= 0) threads.value[index] = thread
    else threads.value.push(thread)
  }

  const threadOf = (type: ThreadSubjectType, id: string) => threads.value.find(t => t.subjectType === type && t.subjectId === id) ?? null

  /** Draws a subject's conversation open. */
  function show(type: ThreadSubjectType, id: string) {
    open.value = { ...open.value, [subjectAnchor(type, id)]: true }
  }

  // Typed loosely on purpose: Nitro's route typing over a plain string path is too deep for tsc.
  const send = $fetch as <T>(url: string, options: { method: 'POST', body?: object }) => Promise<T>

  /** Writes in a subject's conversation: its first message, or a reply. Throws the API's refusal. */
  async function write(type: ThreadSubjectType, id: string, parts: MessagePart[]) {
    const existing = threadOf(type, id)
    put(existing
      ? await send<ThreadDTO>(`/api/threads/${existing.id}/messages`, { method: 'POST', body: { parts } })
      : await send<ThreadDTO>(`/api/investigations/${investigationId.value}/threads`, { method: 'POST', body: { subjectType: type, subjectId: id, parts } }))
  }

  async function setResolved(threadId: string, resolved: boolean) {
    put(await send<ThreadDTO>(`/api/threads/${threadId}/${resolved ? 'resolve' : 'reopen'}`, { method: 'POST' }))
  }

  return { investigationId, threads, members, open, target, load, put, show, threadOf, write, setResolved }
})
