// One JSON line per request for whoever runs the server. Paths are logged without their query
// string and with feed and invitation tokens masked; bodies (passwords) are never logged.
const TOKEN_PATH = /\/(feed|welcome|invitations)\/[^/?]+/g

export function maskLoggedPath(url: string) {
  return url.split('?')[0]!.replace(TOKEN_PATH, '/$1/…')
}

export default defineNitroPlugin((nitroApp) => {
  if (process.env.REQUEST_LOG === 'off') return
  nitroApp.hooks.hook('request', (event) => {
    event.context.startedAt = performance.now()
  })
  nitroApp.hooks.hook('afterResponse', (event) => {
    const started = event.context.startedAt as number | undefined
    const line = {
      at: nowDate().toISOString(),
      method: event.method,
      path: maskLoggedPath(event.path),
      status: event.node.res.statusCode,
      ms: started === undefined ? null : Math.round((performance.now() - started) * 10) / 10
    }
    console.info(JSON.stringify(line))
  })
})
