// Whether the browser has a network connection, kept up to date from the online/offline events.
// On the server (and before the page mounts) it is taken as online. Buttons that need the server
// read it to say so instead of failing silently.
export function useConnection() {
  const online = useState('connection-online', () => true)
  if (import.meta.client) {
    onMounted(() => {
      online.value = navigator.onLine
      const up = () => { online.value = true }
      const down = () => { online.value = false }
      window.addEventListener('online', up)
      window.addEventListener('offline', down)
      onBeforeUnmount(() => {
        window.removeEventListener('online', up)
        window.removeEventListener('offline', down)
      })
    })
  }
  return { online }
}
