import type { ThreadSubjectType } from '../types/conversation'

/**
 * The part of an investigation's address after '#' that names a block, the review of an analysis
 * block, or a claim: the page scrolls to it and opens its conversation, on reload too.
 */
export function subjectAnchor(type: ThreadSubjectType, id: string): string {
  return `${type}-${id}`
}

const ANCHOR = /^#?(review|claim|block)-([0-9a-f-]{36})$/i

/** The subject an anchor names, or null for anything else. */
export function readAnchor(hash: string): { type: ThreadSubjectType, id: string } | null {
  const match = ANCHOR.exec(hash)
  return match ? { type: match[1]!.toLowerCase() as ThreadSubjectType, id: match[2]!.toLowerCase() } : null
}

/** The address of an investigation, at a subject when one is given. */
export function investigationPath(investigationId: string, anchor = ''): string {
  return `/investigations/${investigationId}${anchor ? `#${anchor}` : ''}`
}
