/**
 * Splits text into lines that fit `width` pixels at `fontSize`, for text drawn into chart images
 * (Vega's text marks do not wrap). Widths are estimated from an average glyph width of
 * `factor` × the font size, on the generous side for Inter and Merriweather, so a line never runs
 * past the image's edge; a word longer than a line (a fingerprint) is cut where it overflows.
 */
export function wrapText(text: string, width: number, fontSize: number, factor = 0.56): string[] {
  const perLine = Math.max(8, Math.floor(width / (fontSize * factor)))
  const lines: string[] = []
  let line = ''
  for (const word of text.split(/\s+/).filter(Boolean)) {
    let rest = word
    while (rest.length > perLine) {
      if (line) {
        lines.push(line)
        line = ''
      }
      lines.push(rest.slice(0, perLine))
      rest = rest.slice(perLine)
    }
    if (!line) line = rest
    else if (line.length + 1 + rest.length <= perLine) line += ` ${rest}`
    else {
      lines.push(line)
      line = rest
    }
  }
  if (line) lines.push(line)
  return lines
}
