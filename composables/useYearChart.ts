import type { YearChartData } from '#shared/outlook'

/** A site's whole year of light for the year chart; the caller awaits. */
export function useYearChart(siteId: MaybeRefOrGetter<number>, year: MaybeRefOrGetter<number>) {
  return useFetch<YearChartData>(() => `/api/sites/${toValue(siteId)}/year`, {
    query: computed(() => ({ year: String(toValue(year)) })),
    key: computed(() => `site-year:${toValue(siteId)}:${toValue(year)}`)
  })
}
