// Start-up helpers for the demo scripts: a local service takes its usual port, or any free one when
// that is taken (another program, a second checkout), and says so; failures become one sentence.
import { createServer } from 'node:net'

/**
 * Starts a service on its usual port; when that port is taken, on a free one instead.
 * `start(port)` must reject with the listen error (EADDRINUSE) when it cannot listen.
 * @template {{ port: number }} T
 * @param {string} label what the service is, for the start-up line ("the local mail sink")
 * @param {number} preferred the usual port
 * @param {(port: number) => Promise<T>} start
 * @returns {Promise<{ service: T, note: string | null }>}
 */
export async function startOnPreferredPort(label, preferred, start) {
  try {
    return { service: await start(preferred), note: null }
  } catch (err) {
    if (!isPortUnavailable(err)) throw err
    const service = await start(0)
    return { service, note: `port ${preferred} is taken by another program, so ${label} listens on port ${service.port} instead` }
  }
}

/** True for the listen errors that another program holding the port gives. */
export function isPortUnavailable(err) {
  return err?.code === 'EADDRINUSE' || err?.code === 'EACCES'
}

/** Resolves true when nothing listens on host:port (we could bind it), false when it is taken. */
export function isPortFree(port, host = '0.0.0.0') {
  return new Promise((resolve, reject) => {
    const probe = createServer()
    probe.once('error', err => (isPortUnavailable(err) ? resolve(false) : reject(err)))
    probe.listen(port, host, () => probe.close(() => resolve(true)))
  })
}

/** One sentence for a start-up failure, never a stack trace. */
export function describeStartError(err) {
  if (isPortUnavailable(err)) return `${err.port === undefined ? 'a port' : `port ${err.port}`} cannot be used (${err.code}): another program holds it`
  const text = err instanceof Error ? err.message : String(err)
  return text.split('\n')[0]
}
