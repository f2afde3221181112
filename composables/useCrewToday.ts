import type { CrewToday } from '~~/server/services/crew-day'

export interface CrewTodayView {
  today: CrewToday
  /** When the shown reply was made on the server (ISO). */
  asOf: string
  /** True when the network failed and this is the copy saved on the phone. */
  offline: boolean
}

// A failure with no reply from the server (no connection, the camp link down) or a gateway's.
function isUnreachable(error: unknown): boolean {
  const status = (error as { response?: { status?: number } })?.response?.status
  return status === undefined || status === 502 || status === 504
}

/**
 * The crew home's data: fetched in the browser, kept on the phone for the signed-in person, and read
 * back from there when the network fails (stamped with when it was made). Awaited by the caller.
 */
export function useCrewToday() {
  const { user } = useUserSession()
  const own = useOwnCopy()
  const { report } = useConnection()
  return useAsyncData<CrewTodayView>('crew-today', async () => {
    const personId = user.value?.id ?? 0
    try {
      const today = await $fetch<CrewToday>('/api/me/today')
      own.save('crew-today', personId, today.generatedAt, today)
      own.keepHomePage()
      report(true)
      return { today, asOf: today.generatedAt, offline: false }
    } catch (error) {
      if (isUnreachable(error)) report(false)
      const copy = isUnreachable(error) ? own.read<CrewToday>('crew-today', personId) : null
      if (!copy) throw error
      return { today: copy.data, asOf: copy.savedAt, offline: true }
    }
  }, { server: false })
}
