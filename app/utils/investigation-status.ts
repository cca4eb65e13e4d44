import type { InvestigationStatus } from '#shared/types/investigation'

/** An investigation's status in the words the list and the document's status bar show. */
export const INVESTIGATION_STATUS_LABELS: Record<InvestigationStatus, string> = { 'draft': 'Draft', 'in-review': 'In review', 'published': 'Published' }
