import type { FigureUnits } from '#shared/field'

/** The signed-in person's units for cold and wind figures (their preference; metric until known). */
export function useFigureUnits() {
  const { data } = useFetch<{ units?: FigureUnits }>('/api/me/preferences', { key: 'me-preferences-units' })
  return computed<FigureUnits>(() => data.value?.units ?? 'metric')
}
