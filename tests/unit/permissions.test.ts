import { describe, expect, it } from 'vitest'
import { can } from '#shared/auth/permissions'

// Expected values transcribed from docs/product-rules.md, "Who does what".
describe('the role table', () => {
  it('lets only admins manage members', () => {
    expect(can('admin', 'member.invite')).toBe(true)
    for (const role of ['data-editor', 'fact-checker', 'reporter'] as const) {
      expect(can(role, 'member.invite')).toBe(false)
      expect(can(role, 'member.changeRole')).toBe(false)
      expect(can(role, 'member.remove')).toBe(false)
    }
  })

  it('lets data editors review, lift locks and publish; reporters and fact-checkers not', () => {
    for (const action of ['block.review', 'lock.lift', 'investigation.publish'] as const) {
      expect(can('data-editor', action)).toBe(true)
      expect(can('reporter', action, true)).toBe(false)
      expect(can('fact-checker', action)).toBe(false)
    }
  })

  it('lets fact-checkers read and verify claims but not write', () => {
    expect(can('fact-checker', 'claim.verify')).toBe(true)
    expect(can('fact-checker', 'investigation.read')).toBe(true)
    expect(can('fact-checker', 'investigation.edit', true)).toBe(false)
    expect(can('fact-checker', 'dataset.create')).toBe(false)
  })

  it('lets reporters edit their own investigations only; data editors every one', () => {
    expect(can('reporter', 'investigation.edit', true)).toBe(true)
    expect(can('reporter', 'investigation.edit', false)).toBe(false)
    expect(can('data-editor', 'investigation.edit', false)).toBe(true)
    expect(can('reporter', 'claim.verify')).toBe(false)
  })

  it('lets every member write in an investigation\'s conversations (docs/product-rules.md, "Conversations and notifications")', () => {
    for (const role of ['admin', 'data-editor', 'fact-checker', 'reporter'] as const) expect(can(role, 'conversation.write')).toBe(true)
  })
})
