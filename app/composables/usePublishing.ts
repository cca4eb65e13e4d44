import type { output } from 'zod'
import type { publishSchema } from '#shared/schemas/investigation'
import type { PublishedSnapshot, PublishingDTO, PublishOutcomeDTO, WithdrawOutcomeDTO } from '#shared/types/publication'
import type { PublicationChangesDTO } from '#shared/types/history'

/**
 * The publishing panel of the investigation open in the document store: its open checks, who did
 * each check, and its links; with publishing a version and withdrawing a link.
 */
export function usePublishing() {
  const store = useDocumentStore()
  const id = computed(() => store.investigation?.id ?? '')
  const { data, refresh } = useFetch<PublishingDTO>(() => `/api/investigations/${id.value}/publishing`, {
    key: computed(() => `publishing-${id.value}`),
  })
  // The checks change with a review or a claim, never with typing (the store's checksKey).
  watch(() => store.checksKey, () => refresh())

  async function publish(options: output<typeof publishSchema>) {
    const { link } = await $fetch<PublishOutcomeDTO>(`/api/investigations/${id.value}/publish`, { method: 'POST', body: options })
    // Publishing adds the newest link and changes nothing that is checked; the draft is now published.
    if (data.value) data.value = { ...data.value, links: [link, ...data.value.links] }
    if (store.investigation) store.investigation.status = 'published'
  }

  /** Shows the link withdrawn and the investigation's status as the server answers them (back in review once its last live link is gone). */
  async function withdraw(linkId: string) {
    const { link, investigationStatus } = await $fetch<WithdrawOutcomeDTO>(`/api/share-links/${linkId}/revoke`, { method: 'POST' })
    if (data.value) data.value = { ...data.value, links: data.value.links.map(l => l.id === link.id ? link : l) }
    if (store.investigation) store.investigation.status = investigationStatus
  }

  return { publishing: data, publish, withdraw }
}

/** What the draft changed since one publication, block by block. */
export function usePublicationChanges(publicationId: Ref<string>) {
  const { data, error, status } = useFetch<PublicationChangesDTO>(() => `/api/publications/${publicationId.value}/changes`, {
    key: computed(() => `publication-changes-${publicationId.value}`),
  })
  return { changes: data, error, pending: computed(() => status.value === 'pending') }
}

/** A published version as its public link shows it, to anyone with the link; a withdrawn or expired one answers 410. */
export function usePublishedSnapshot(token: string) {
  return useFetch<PublishedSnapshot>(`/api/public/${token}`, { key: `public-${token}` })
}
