import type { InvitationDTO, MemberDTO } from '#shared/types/dto'
import type { Role } from '#shared/auth/roles'

/** A newsroom's members; an empty list until the newsroom is known (a page that learns it from a record). */
export function useNewsroomMembers(newsroomId: Ref<string>) {
  const requestFetch = useRequestFetch()
  return useAsyncData(
    computed(() => `members-${newsroomId.value}`),
    () => (newsroomId.value ? requestFetch<MemberDTO[]>(`/api/newsrooms/${newsroomId.value}/members`) : Promise.resolve([])),
    { default: () => [] },
  )
}

/** Members and pending invitations of a newsroom, with the admin's actions on them, each shown as the server answered it. */
export function useMembers(newsroomId: Ref<string>, canManage: Ref<boolean>) {
  const members = useNewsroomMembers(newsroomId)
  const invitations = useFetch<InvitationDTO[]>(() => `/api/newsrooms/${newsroomId.value}/invitations`, {
    key: computed(() => `invitations-${newsroomId.value}`),
    default: () => [],
    immediate: canManage.value,
    watch: [canManage],
  })

  async function invite(email: string, role: Role) {
    const invitation = await $fetch<InvitationDTO>(`/api/newsrooms/${newsroomId.value}/invitations`, { method: 'POST', body: { email, role } })
    // Listed newest first; a new invitation replaces one still pending for the same address.
    invitations.data.value = [invitation, ...invitations.data.value.filter(i => i.email !== invitation.email)]
  }
  async function withdraw(invitationId: string) {
    await $fetch(`/api/newsrooms/${newsroomId.value}/invitations/${invitationId}`, { method: 'DELETE' })
    invitations.data.value = invitations.data.value.filter(i => i.id !== invitationId)
  }
  async function changeRole(membershipId: string, role: Role) {
    await $fetch(`/api/memberships/${membershipId}`, { method: 'PATCH', body: { role } })
    members.data.value = members.data.value.map(m => (m.membershipId === membershipId ? { ...m, role } : m))
  }
  async function remove(membershipId: string) {
    await $fetch(`/api/memberships/${membershipId}`, { method: 'DELETE' })
    members.data.value = members.data.value.filter(m => m.membershipId !== membershipId)
  }

  return {
    members: members.data,
    invitations: invitations.data,
    invite, withdraw, changeRole, remove,
  }
}
