import type { SiteLightReply } from '#shared/planning'

/** A site's light for a range of local dates (`to` inclusive); the caller awaits. */
export function useSiteLight(siteId: MaybeRefOrGetter<number>, from: MaybeRefOrGetter<string>, to: MaybeRefOrGetter<string>) {
  return useFetch<SiteLightReply>(() => `/api/sites/${toValue(siteId)}/light`, {
    query: computed(() => ({ from: toValue(from), to: toValue(to) })),
    key: computed(() => `site-light:${toValue(siteId)}:${toValue(from)}:${toValue(to)}`)
  })
}
