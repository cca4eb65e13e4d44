/**
 * Text that is one line wherever it is shown (a title, or a note quoted in a list item): runs of
 * white space, new lines included, become one space, so pasted text can never start a heading or
 * a list item of its own in the generated methodology.
 */
export function oneLine(text: string): string {
  return text.replace(/\s+/g, ' ').trim()
}
