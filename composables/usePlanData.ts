import { storeToRefs } from 'pinia'
import type { Ref } from 'vue'
import { addDays, fromWallClock, localDateIn } from '#shared/format'
import { calendarRange, type SiteLight } from '#shared/calendar'
import type { ShiftReply, SiteItem, SiteLightReply } from '#shared/planning'

/** The plan calendar's data: its zone and range, the shifts in it and each chosen site's light. */
// Choose the sites before calling it: the fetch keys follow the range and zone, and a key that
// changes during server rendering leaves the data of the new key unset.
export function usePlanData(sites: Ref<SiteItem[]>) {
  const store = useCalendarStore()
  const { view, date, siteIds, displayZone } = storeToRefs(store)
  // the browser's own zone is only known in the browser; the calendar renders there only
  const viewerZone = ref('UTC')
  onMounted(() => {
    viewerZone.value = Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC'
  })

  const chosenSites = computed(() => siteIds.value.map(id => sites.value.find(s => s.id === id)).filter((s): s is SiteItem => Boolean(s)))
  const zone = computed(() => {
    if (displayZone.value === 'viewer') return viewerZone.value
    if (displayZone.value !== 'site' && chosenSites.value.some(s => s.timezone === displayZone.value)) return displayZone.value
    return chosenSites.value[0]?.timezone ?? viewerZone.value
  })
  const renderedAt = useNowMs()
  const today = computed(() => localDateIn(renderedAt, zone.value))
  const anchor = computed(() => date.value || today.value)
  const range = computed(() => calendarRange(view.value, anchor.value))

  const shiftQuery = computed(() => ({
    from: new Date(fromWallClock(`${range.value.from}T00:00`, zone.value)).toISOString(),
    to: new Date(fromWallClock(`${range.value.to}T00:00`, zone.value)).toISOString()
  }))
  const shifts = useFetch<ShiftReply[]>('/api/shifts', { query: shiftQuery, server: false, default: () => [] })
  const visibleShifts = computed(() => (shifts.data.value ?? []).filter(s => siteIds.value.includes(s.siteId) && !s.cancelled))

  // one day either side: a site's local days need not line up with the display zone's
  // One fixed key, refetched whenever the sites or the range change: with a key that followed them,
  // switching sites could leave the previous sites' light (and lanes) on the calendar until a reload.
  const lightKey = computed(() => `${siteIds.value.join(',')}:${range.value.from}:${range.value.to}`)
  const lights = useAsyncData<SiteLight[]>('plan-light', async () => {
    const query = { from: addDays(range.value.from, -1), to: range.value.to }
    const replies = await Promise.all(chosenSites.value.map(site => $fetch<SiteLightReply>(`/api/sites/${site.id}/light`, { query })
      .then(reply => ({ site, days: reply.days }))))
    return replies
  }, { server: false, default: () => [], watch: [lightKey, chosenSites] })

  return { view, date, siteIds, displayZone, viewerZone, chosenSites, zone, today, anchor, range, shifts, visibleShifts, lights }
}
