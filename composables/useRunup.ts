import type { RunupSummary } from '#shared/outlook'

/** A site's run-up to (or out of) polar night for N hours of civil light; the caller awaits. */
export function useRunup(siteId: MaybeRefOrGetter<number>, minCivilHours: MaybeRefOrGetter<number>) {
  return useFetch<RunupSummary>(() => `/api/sites/${toValue(siteId)}/runup`, {
    query: computed(() => ({ minCivilHours: String(toValue(minCivilHours)) })),
    key: computed(() => `site-runup:${toValue(siteId)}:${toValue(minCivilHours)}`)
  })
}
