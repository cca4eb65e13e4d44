import type { Role } from '../auth/roles'

export interface UserDTO {
  id: string
  name: string
  email: string
}

export interface MembershipDTO {
  newsroomId: string
  newsroomName: string
  role: Role
}

export interface MeDTO {
  user: UserDTO
  memberships: MembershipDTO[]
  notifyByEmail: boolean
}

export interface MemberDTO {
  membershipId: string
  userId: string
  name: string
  email: string
  role: Role
  joinedAt: string
}

export interface InvitationDTO {
  id: string
  email: string
  role: Role
  invitedBy: string
  expiresAt: string
  createdAt: string
}

export interface InvitationPeekDTO {
  newsroomName: string
  email: string
  role: Role
  existingAccount: boolean
  expiresAt: string
}

export interface NewsroomDTO {
  id: string
  name: string
  role: Role
  memberCount: number
  /** Four eyes: whoever approves a method or verifies a claim is never its author. */
  fourEyes: boolean
}

export interface MailMessageDTO {
  id: string
  to: string[]
  from: string
  subject: string
  text: string
  receivedAt: string
}
