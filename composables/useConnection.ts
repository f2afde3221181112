// Whether the server can be reached. The browser's own online flag is only a hint: a phone on a camp
// network whose outside link is down still says it is online. So the state follows what actually
// happened: a reply from the server (any status) means reachable, a request that got no reply means
// not, and `probe()` asks the server's health route to find out. Buttons and pages that need the
// server read `online` to say so instead of failing silently.
export function useConnection() {
  const online = useState('connection-online', () => true)

  function report(reachable: boolean) {
    online.value = reachable
  }

  async function probe() {
    if (!import.meta.client) return
    try {
      // read the (small) body: an unread reply keeps the request open in the browser
      await (await fetch('/health', { cache: 'no-store' })).text()
      online.value = true
    } catch {
      online.value = false
    }
  }

  if (import.meta.client) {
    onMounted(() => {
      if (!navigator.onLine) online.value = false
      const up = () => probe()
      const down = () => { online.value = false }
      window.addEventListener('online', up)
      window.addEventListener('offline', down)
      onBeforeUnmount(() => {
        window.removeEventListener('online', up)
        window.removeEventListener('offline', down)
      })
    })
  }
  return { online, report, probe }
}
