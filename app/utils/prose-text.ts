// One reading of a block's text for conflict notes, summaries and history (shared with the server).
export { proseText } from '#shared/history/prose-text'
