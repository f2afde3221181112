import { defineStore } from 'pinia'
import { addDays } from '#shared/format'

export type CalendarView = 'week' | 'month'

/** What the plan calendar shows: view, anchor date, chosen sites and the zone times are shown in. */
export const useCalendarStore = defineStore('calendar', () => {
  const view = ref<CalendarView>('week')
  // the local date the view is anchored on, YYYY-MM-DD; '' means today
  const date = ref('')
  const siteIds = ref<number[]>([])
  // 'site': the first chosen site's zone; 'viewer': this browser's own zone; or an IANA name
  const displayZone = ref<string>('site')

  function chooseSites(ids: number[]) {
    siteIds.value = [...new Set(ids)]
  }

  function toggleSite(id: number) {
    chooseSites(siteIds.value.includes(id) ? siteIds.value.filter(s => s !== id) : [...siteIds.value, id])
  }

  function step(direction: 1 | -1, today: string) {
    const from = date.value || today
    if (view.value === 'week') {
      date.value = addDays(from, 7 * direction)
      return
    }
    const [y, m] = from.split('-').map(Number) as [number, number]
    const next = new Date(Date.UTC(y, m - 1 + direction, 1))
    date.value = next.toISOString().slice(0, 10)
  }

  return { view, date, siteIds, displayZone, chooseSites, toggleSite, step }
})
