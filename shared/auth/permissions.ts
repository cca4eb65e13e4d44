import type { Role } from './roles'

/**
 * Who may do what, in one table (docs/product-rules.md, "Who does what").
 * 'any' = on every record of the newsroom; 'own' = only on records the member created.
 * The server decides with this table; pages use it only to hide buttons.
 */
type Scope = 'any' | 'own' | false

const TABLE = {
  'newsroom.read': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': 'any', 'reporter': 'any' },
  'member.invite': { 'admin': 'any', 'data-editor': false, 'fact-checker': false, 'reporter': false },
  'member.changeRole': { 'admin': 'any', 'data-editor': false, 'fact-checker': false, 'reporter': false },
  'member.remove': { 'admin': 'any', 'data-editor': false, 'fact-checker': false, 'reporter': false },
  'dataset.read': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': 'any', 'reporter': 'any' },
  'dataset.create': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': 'any' },
  'dataset.archive': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': 'own' },
  'investigation.read': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': 'any', 'reporter': 'any' },
  'investigation.create': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': 'any' },
  'investigation.edit': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': 'own' },
  'review.request': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': 'own' },
  'block.review': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': false },
  'claim.mark': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': 'own' },
  'claim.remove': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': false },
  'claim.verify': { 'admin': 'any', 'data-editor': false, 'fact-checker': 'any', 'reporter': false },
  'lock.lift': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': false },
  // Every member who reads an investigation writes in its conversations (docs/product-rules.md).
  'conversation.write': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': 'any', 'reporter': 'any' },
  'audit.read': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': 'any', 'reporter': 'any' },
  'investigation.publish': { 'admin': 'any', 'data-editor': 'any', 'fact-checker': false, 'reporter': false },
  'newsroom.configure': { 'admin': 'any', 'data-editor': false, 'fact-checker': false, 'reporter': false },
} as const satisfies Record<string, Record<Role, Scope>>

export type Action = keyof typeof TABLE

/** True when `role` may do `action`; `isOwner` matters only for actions scoped to one's own records. */
export function can(role: Role, action: Action, isOwner = false): boolean {
  const scope: Scope = TABLE[action][role]
  return scope === 'any' || (scope === 'own' && isOwner)
}
