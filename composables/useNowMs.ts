// "Now" for the pages. Rendered on the server: the server's clock (set on the request by
// server/middleware/0.render-clock.ts), kept in the payload so the browser's first render, while
// hydrating, shows the same day; after that, the browser's own clock.
export function useNowMs(): number {
  const nuxtApp = tryUseNuxtApp()
  if (!nuxtApp) return Date.now()
  if (import.meta.server) {
    const rendered = useState<number>('gl-render-now', () => (useRequestEvent()?.context.gloamlineNowMs as number | undefined) ?? Date.now())
    return rendered.value
  }
  if (nuxtApp.isHydrating) {
    const rendered = useState<number | null>('gl-render-now', () => null)
    if (typeof rendered.value === 'number') return rendered.value
  }
  return Date.now()
}
