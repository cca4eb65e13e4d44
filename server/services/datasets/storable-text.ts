/**
 * PostgreSQL text holds neither NUL nor half of a surrogate pair (a JSON "\\ud800" escape): both
 * failed the import when they reached a column name or a sampled cell. NUL is dropped, a broken
 * pair becomes U+FFFD, as a text decoder does with broken bytes.
 */
export function storable(text: string): string {
  return (text.includes('\0') ? text.replaceAll('\0', '') : text).toWellFormed()
}
