import { describeLightState, type ShiftCheckReply, type ShiftDraft, type ShiftReply } from '#shared/planning'

export type ShiftActionResult
  = | { ok: true, shift: ShiftReply }
    | { ok: false, status: number, message: string, fields: Record<string, string> }

function failure(err: unknown): ShiftActionResult {
  const status = (err as { statusCode?: number, status?: number })?.statusCode ?? (err as { status?: number })?.status ?? 0
  return { ok: false, status, message: describeFetchError(err), fields: fieldErrorsFrom(err) }
}

function toBody(draft: ShiftDraft) {
  return {
    siteId: draft.siteId, title: draft.title, start: draft.start, end: draft.end, light: draft.light,
    assigneeIds: draft.assigneeIds, notes: draft.notes, overrideReason: draft.overrideReason.trim() || undefined,
    travelMinutes: typeof draft.travelMinutes === 'number' ? draft.travelMinutes : undefined
  }
}

/** Every change to a shift, one function each: saves, refreshes what changed and tells the person. */
export function useShiftActions(refresh: () => unknown = () => undefined) {
  const { say } = useNotice()

  async function report(result: ShiftActionResult, done: string) {
    if (result.ok) {
      await refresh()
      const conflicts = result.shift.conflicts?.length ?? 0
      const notes = result.shift.timeNotes?.length ? ` ${result.shift.timeNotes.join('. ')}.` : ''
      say(`${done}${notes}${conflicts && !result.shift.conflictOverride ? ` ${conflicts} conflict warning${conflicts > 1 ? 's' : ''}: open the shift to give a reason or change it.` : ''}`, conflicts || notes ? 'warning' : 'success')
    } else say(result.message, 'error')
    return result
  }

  async function createShift(draft: ShiftDraft) {
    const result = await $fetch<ShiftReply>('/api/shifts', { method: 'POST', body: toBody(draft) })
      .then((shift): ShiftActionResult => ({ ok: true, shift }), failure)
    return report(result, result.ok ? `Shift “${result.shift.title}” planned.` : '')
  }

  async function updateShift(id: number, version: number, draft: ShiftDraft) {
    const result = await $fetch<ShiftReply>(`/api/shifts/${id}`, { method: 'PATCH', body: { ...toBody(draft), version } })
      .then((shift): ShiftActionResult => ({ ok: true, shift }), failure)
    return report(result, result.ok ? `Shift “${result.shift.title}” saved.` : '')
  }

  /** Moves or resizes a shift: start/end as the site's wall clock or ISO instants. */
  async function moveShift(shift: ShiftReply, start: string, end: string) {
    const result = await $fetch<ShiftReply>(`/api/shifts/${shift.id}`, { method: 'PATCH', body: { start, end, version: shift.version } })
      .then((moved): ShiftActionResult => ({ ok: true, shift: moved }), failure)
    return report(result, result.ok ? `Moved “${result.shift.title}”: ${describeLightState(result.shift).label}.` : '')
  }

  async function cancelShift(shift: ShiftReply) {
    const result = await $fetch<ShiftReply>(`/api/shifts/${shift.id}`, { method: 'DELETE', query: { version: shift.version } })
      .then((): ShiftActionResult => ({ ok: true, shift: { ...shift, cancelled: true, conflicts: [], timeNotes: [] } }), failure)
    return report(result, `Shift “${shift.title}” cancelled.`)
  }

  /** Previews the light check and conflicts of a draft without saving it. */
  async function checkShift(draft: ShiftDraft, shiftId?: number) {
    return $fetch<ShiftCheckReply>('/api/shifts/check', { method: 'POST', body: { ...toBody(draft), shiftId } })
  }

  return { createShift, updateShift, moveShift, cancelShift, checkShift }
}
