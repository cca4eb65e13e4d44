/**
 * The block the address's '#' part points at (a block, the review of one, or a claim's block), and
 * in the browser, bringing it into view: the claim's passage or the block, centred, with the focus on
 * its conversation. The editor draws its text after the page, so the passage is looked for a few times.
 */
export function useTargetBlock() {
  const store = useDocumentStore()
  const conversation = useConversationStore()
  const targetBlockId = computed(() => {
    const target = conversation.target
    if (!target) return null
    if (target.type === 'claim') return store.claims.find(c => c.id === target.id)?.blockId ?? null
    return store.blocks.some(b => b.id === target.id) ? target.id : null
  })
  const missing = computed(() => Boolean(conversation.target && store.investigation && !targetBlockId.value))

  function bringIntoView(tries = 12) {
    const target = conversation.target
    if (!target || !targetBlockId.value) return
    const passage = target.type === 'claim' ? document.querySelector(`.prose-mantissa [data-claim="${target.id}"]`) : null
    if (target.type === 'claim' && !passage && tries > 0) {
      setTimeout(() => bringIntoView(tries - 1), 100)
      return
    }
    ;(passage ?? document.getElementById(`block-${targetBlockId.value}`))?.scrollIntoView({ block: 'center' })
    document.getElementById(`${target.type}-${target.id}-conversation`)?.focus({ preventScroll: true })
  }

  onMounted(() => {
    watch([() => conversation.target, targetBlockId], () => nextTick(() => bringIntoView()), { immediate: true })
  })
  return { targetBlockId, missing }
}
