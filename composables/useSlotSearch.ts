import type { LightRequirement } from '#shared/light'
import type { SlotRank, SlotSearchResult } from '#shared/outlook'

export interface SlotQuery {
  siteId: number
  durationMinutes: number
  light: LightRequirement
  from: string
  to: string
  assigneeIds: number[]
  crewId?: number
  headcount?: number
  rank: SlotRank
  perDay: number
  // minutes each way; absent: the site's default
  travelMinutes?: number
}

/** Runs slot searches and keeps the last answer, or the server's message and field errors. */
export function useSlotSearch() {
  const result = ref<SlotSearchResult | null>(null)
  const error = ref('')
  const fields = ref<Record<string, string>>({})
  const busy = ref(false)

  async function search(query: SlotQuery) {
    busy.value = true
    error.value = ''
    fields.value = {}
    try {
      result.value = await $fetch<SlotSearchResult>('/api/slots/search', { method: 'POST', body: query })
    } catch (err) {
      result.value = null
      error.value = describeFetchError(err)
      fields.value = fieldErrorsFrom(err)
    } finally {
      busy.value = false
    }
  }

  return { result, error, fields, busy, search }
}
