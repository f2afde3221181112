import type { Ref } from 'vue'

export interface ZoneSuggestionReply {
  timezone: string
  zoneOffsetMinutes: number
  solarOffsetMinutes: number
  differenceMinutes: number
  warning: string | null
  candidates?: string[]
}

/** The zone suggested for coordinates, and how far the chosen zone's clock is from the sun there. */
export function useZoneSuggestion(lat: Ref<number | null>, lon: Ref<number | null>, zone: Ref<string>) {
  const suggestion = ref<ZoneSuggestionReply | null>(null)
  const chosen = ref<ZoneSuggestionReply | null>(null)
  const error = ref('')
  let timer: ReturnType<typeof setTimeout> | undefined

  async function run() {
    if (lat.value === null || lon.value === null) {
      suggestion.value = chosen.value = null
      return
    }
    const base = { lat: lat.value, lon: lon.value }
    try {
      const [s, c] = await Promise.all([
        $fetch<ZoneSuggestionReply>('/api/sites/zone-suggestion', { query: base }),
        zone.value ? $fetch<ZoneSuggestionReply>('/api/sites/zone-suggestion', { query: { ...base, tz: zone.value } }) : Promise.resolve(null)
      ])
      suggestion.value = s
      chosen.value = c
      error.value = ''
    } catch (err) {
      error.value = describeFetchError(err)
    }
  }

  watch([lat, lon, zone], () => {
    clearTimeout(timer)
    timer = setTimeout(run, 300)
  }, { immediate: true })
  onBeforeUnmount(() => clearTimeout(timer))
  return { suggestion, chosen, error }
}
