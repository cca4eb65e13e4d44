// Keys that, on a closed dropdown, show the next option at once: arrows, page keys and type-ahead letters.
// Space and Alt+↓ open the list instead, and a choice made in the open list counts at once.
function browses(event: KeyboardEvent): boolean {
  if (event.altKey || event.ctrlKey || event.metaKey) return false
  return /^(Arrow(Up|Down|Left|Right)|Home|End|PageUp|PageDown)$/.test(event.key) || (event.key.length === 1 && event.key !== ' ')
}

/**
 * Listeners for a <select> (`v-on="choice"`) that report a choice once it is made. Chromium fires
 * `change` for every option a person arrows past on a closed dropdown; those wait for Enter, for
 * leaving the field, or are dropped with Escape. A pick with the mouse or in the open list counts
 * at once.
 */
export function useSelectChoice(choose: (value: string) => void) {
  let browsing = false
  // What the field showed before the key that changed it: Escape goes back to it.
  let before = ''
  let pending: { value: string, original: string } | null = null

  function commit() {
    if (!pending) return
    const { value, original } = pending
    pending = null
    if (value !== original) choose(value)
  }

  return {
    keydown(event: KeyboardEvent) {
      const select = event.target as HTMLSelectElement
      if (event.key === 'Enter') commit()
      else if (event.key === 'Escape' && pending) {
        select.value = pending.original
        pending = null
      }
      browsing = browses(event)
      if (!pending) before = select.value
    },
    change(event: Event) {
      const value = (event.target as HTMLSelectElement).value
      if (!browsing) return choose(value)
      pending = { value, original: pending?.original ?? before }
    },
    blur: commit,
    pointerdown() {
      browsing = false
    },
  }
}
