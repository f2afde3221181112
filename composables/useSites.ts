import type { SiteItem } from '#shared/planning'

/** The sites list (archived ones too when asked); the caller awaits. */
export function useSites(includeArchived: MaybeRefOrGetter<boolean> = false) {
  return useFetch<SiteItem[]>('/api/sites', {
    query: computed(() => (toValue(includeArchived) ? { archived: '1' } : {})),
    default: () => []
  })
}
