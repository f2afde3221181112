// A database that cannot be written (read-only file, full disk, I/O error, locked too long) answers
// 503 with a plain message instead of an unhandled 500, so a client can tell "try later" from a bug.
const UNAVAILABLE_CODES = /^SQLITE_(READONLY|FULL|IOERR|CANTOPEN|BUSY|LOCKED|CORRUPT|NOTADB)/

export default defineNitroPlugin((nitroApp) => {
  const original = nitroApp.h3App.options.onError
  nitroApp.h3App.options.onError = (error, event) => {
    const code = (error.cause as { code?: unknown } | undefined)?.code
    if (typeof code === 'string' && UNAVAILABLE_CODES.test(code)) {
      console.error(`[gloamline] storage unavailable: ${code}`)
      error.statusCode = 503
      error.statusMessage = 'Service Unavailable'
      error.message = 'The database cannot be written right now (disk full, read-only or busy). Nothing was saved; try again later.'
      error.unhandled = false
      setResponseStatus(event, 503, 'Service Unavailable')
    }
    return original?.(error, event)
  }
})
