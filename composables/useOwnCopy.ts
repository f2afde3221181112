// What the phone keeps for use with no connection: the signed-in person's own replies (their crew
// home: their shifts and sites, nothing of anyone else), each stamped with the person's id and the
// time it was saved, plus the crew home page itself in one Cache Storage cache that the service
// worker serves only when the network fails (nuxt.config.ts, `pwa`). Signing out deletes all of it.
const PREFIX = 'gloamline-own:'
export const OWN_PAGES_CACHE = 'gloamline-own-pages'

export interface OwnCopy<T> { personId: number, savedAt: string, data: T }

function storage(): Storage | null {
  try {
    return import.meta.client ? window.localStorage : null
  } catch {
    return null
  }
}

/** Saves a reply for one person (it replaces the previous copy under the same name). */
function save<T>(name: string, personId: number, savedAt: string, data: T) {
  try {
    storage()?.setItem(PREFIX + name, JSON.stringify({ personId, savedAt, data } satisfies OwnCopy<T>))
  } catch {
    // storage full or blocked: the page still works online, it just cannot be read offline
  }
}

/** The saved copy for this person, or null; a copy left by anyone else is deleted, never shown. */
function read<T>(name: string, personId: number): OwnCopy<T> | null {
  const store = storage()
  const text = store?.getItem(PREFIX + name)
  if (!store || !text) return null
  try {
    const copy = JSON.parse(text) as OwnCopy<T>
    if (copy.personId === personId) return copy
  } catch {
    // unreadable: treated as no copy
  }
  store.removeItem(PREFIX + name)
  return null
}

/** Stores the current page ('/') for offline reopening: fetched again so that it is this person's own. */
async function keepHomePage() {
  // Cache Storage is shared with the service worker, which reads this cache when the network fails
  if (!import.meta.client || !('caches' in window) || !('serviceWorker' in navigator)) return
  try {
    const cache = await caches.open(OWN_PAGES_CACHE)
    await cache.add(new Request('/', { credentials: 'same-origin' }))
  } catch {
    // no connection or no space: the previous copy stays
  }
}

/** Deletes every saved reply and the stored page (on sign-out, and when another person signs in). */
async function clearAll() {
  const store = storage()
  if (store) {
    for (const key of Object.keys(store)) {
      if (key.startsWith(PREFIX)) store.removeItem(key)
    }
  }
  if (import.meta.client && 'caches' in window) await caches.delete(OWN_PAGES_CACHE).catch(() => false)
}

export function useOwnCopy() {
  return { save, read, keepHomePage, clearAll }
}
