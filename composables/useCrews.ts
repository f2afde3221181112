import type { CrewItem } from '#shared/planning'

/** Named crews with their members; the caller awaits. */
export function useCrews() {
  return useFetch<CrewItem[]>('/api/crews', { default: () => [] })
}
