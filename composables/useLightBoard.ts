import type { BoardData } from '#shared/outlook'

/** Every site's light today and tomorrow, with the next change of season; the caller awaits. */
export function useLightBoard(minCivilHours: MaybeRefOrGetter<number>) {
  return useFetch<BoardData>('/api/board', {
    query: computed(() => ({ minCivilHours: String(toValue(minCivilHours)) })),
    key: computed(() => `light-board:${toValue(minCivilHours)}`)
  })
}
