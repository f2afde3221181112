// The one clock. Everything that needs "now" on the server asks nowMs(); nothing else reads the real
// clock. Tests and the demo seed move it: a fixed instant, or a start instant from which time runs on
// at the real pace (so timers still fire). Pure: no framework, database or network.

/** A source of the current instant, in ms since the epoch. */
export type ClockSource = () => number

const realClock: ClockSource = () => Date.now()
let source: ClockSource = realClock

/** The current instant in ms, from the installed clock (the real one unless moved). */
export function nowMs(): number {
  return source()
}

/** The current instant as a Date. */
export function nowDate(): Date {
  return new Date(source())
}

/** Installs a clock; with no argument, puts the real clock back. */
export function setClock(next: ClockSource = realClock) {
  source = next
}

/** A clock that stands still at one instant (unit tests). */
export function fixedClock(atMs: number): ClockSource {
  return () => atMs
}

/** A clock that starts at `startMs` now and runs on at the real pace (the built server under test). */
export function runningClockFrom(startMs: number, realNow: ClockSource = realClock): ClockSource {
  const offset = startMs - realNow()
  return () => realNow() + offset
}
