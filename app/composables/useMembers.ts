import type { InvitationDTO, MemberDTO } from '#shared/types/dto'
import type { Role } from '#shared/auth/roles'

/** Members and pending invitations of a newsroom, with the admin's actions on them. */
export function useMembers(newsroomId: Ref<string>, canManage: Ref<boolean>) {
  const members = useFetch<MemberDTO[]>(() => `/api/newsrooms/${newsroomId.value}/members`, {
    key: computed(() => `members-${newsroomId.value}`),
    default: () => [],
  })
  const invitations = useFetch<InvitationDTO[]>(() => `/api/newsrooms/${newsroomId.value}/invitations`, {
    key: computed(() => `invitations-${newsroomId.value}`),
    default: () => [],
    immediate: canManage.value,
    watch: [canManage],
  })

  async function invite(email: string, role: Role) {
    await $fetch(`/api/newsrooms/${newsroomId.value}/invitations`, { method: 'POST', body: { email, role } })
    await invitations.refresh()
  }
  async function withdraw(invitationId: string) {
    await $fetch(`/api/newsrooms/${newsroomId.value}/invitations/${invitationId}`, { method: 'DELETE' })
    await invitations.refresh()
  }
  async function changeRole(membershipId: string, role: Role) {
    await $fetch(`/api/memberships/${membershipId}`, { method: 'PATCH', body: { role } })
    await members.refresh()
  }
  async function remove(membershipId: string) {
    await $fetch(`/api/memberships/${membershipId}`, { method: 'DELETE' })
    await members.refresh()
  }

  return {
    members: members.data,
    invitations: invitations.data,
    pending: computed(() => members.status.value === 'pending'),
    invite, withdraw, changeRole, remove,
  }
}
