export const ROLES = ['admin', 'data-editor', 'fact-checker', 'reporter'] as const
export type Role = typeof ROLES[number]

export const ROLE_LABELS: Record<Role, string> = {
  'admin': 'Admin',
  'data-editor': 'Data editor',
  'fact-checker': 'Fact-checker',
  'reporter': 'Reporter',
}
