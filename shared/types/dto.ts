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
  /** The newsroom asks its members to sign in with an authenticator code. */
  requireTwoFactor: boolean
}

export interface MeDTO {
  user: UserDTO
  memberships: MembershipDTO[]
  notifyByEmail: boolean
  /** A mention in a conversation is e-mailed too (on unless turned off). */
  emailMentions: boolean
  /** Two-factor sign-in: on for the account, used by this session, recovery codes left. */
  twoFactor: { enabled: boolean, thisSession: boolean, recoveryCodesLeft: number }
}

/** One open session of the signed-in person (account page). */
export interface SessionDTO {
  id: string
  createdAt: string
  lastSeenAt: string
  ip: string
  userAgent: string
  secondFactor: boolean
  current: boolean
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
  requireTwoFactor: boolean
}

export interface MailMessageDTO {
  id: string
  to: string[]
  from: string
  subject: string
  text: string
  receivedAt: string
}

/** A pending authenticator: the secret to type in, the otpauth URI, and its QR code as rows of dark (true) modules. */
export interface TwoFactorSetupDTO {
  secret: string
  uri: string
  qr: boolean[][]
}
