import type { PersonItem } from '#shared/planning'

/** Everyone with an account, active or not; the caller awaits. */
export function usePeople() {
  return useFetch<PersonItem[]>('/api/people', { default: () => [] })
}
