// Called by the shift service after a shift change is committed. The mail side decides who hears
// of it (assignees on change or cancellation, safety officers when new work is flagged).
export interface ShiftChangeNotice {
  kind: 'created' | 'updated' | 'cancelled'
  shiftId: number
  actorId: number
  previousAssigneeIds: number[]
  material: boolean
}

type Listener = (notice: ShiftChangeNotice) => void | Promise<void>
const listeners: Listener[] = []

/** Registers a listener for committed shift changes (a Nitro plugin does this at start). */
export function onShiftChange(listener: Listener) {
  listeners.push(listener)
}

/** Tells every listener; a failing listener is logged and never undoes the committed change. */
export function announceShiftChange(notice: ShiftChangeNotice) {
  for (const listener of listeners) {
    Promise.resolve().then(() => listener(notice)).catch(err => console.error('[gloamline] shift notice failed', err))
  }
}
