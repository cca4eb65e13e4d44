import type { Result as EmbedResult } from 'vega-embed'

/**
 * Draws a Vega-Lite specification into a container and redraws it when the specification changes.
 * Expressions go through Vega's interpreter: the CSP forbids compiling them to functions.
 */
export function useVegaChart(container: Ref<HTMLElement | null>, spec: () => object, onDrawn?: (result: EmbedResult) => void) {
  let embedded: EmbedResult | null = null
  async function draw() {
    if (!container.value) return
    const [{ default: embed }, { expressionInterpreter }] = await Promise.all([import('vega-embed'), import('vega-interpreter')])
    embedded?.finalize()
    embedded = await embed(container.value, spec() as never, { actions: false, renderer: 'svg', ast: true, expr: expressionInterpreter })
    onDrawn?.(embedded)
  }
  onMounted(draw)
  watch(spec, draw)
  onBeforeUnmount(() => embedded?.finalize())
  return { view: () => embedded?.view }
}
