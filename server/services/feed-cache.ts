// The calendar feed's reply cache: one prepared reply (text, ETag, compressed bodies) per person,
// database version and quarter hour, so a calendar app polling the feed costs a lookup, and a 304
// when nothing changed. Renders of the same feed at once share one render.
import type { Person } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { createReplyCache, prepareTextReply, readDataStamp, type CachedReply } from '../utils/response-cache'
import { nowMs } from '../core/time/clock'
import { renderPersonFeed } from './feed'

// The feed's window and its sunrise days move with the clock: it is rendered for the start of the
// current quarter hour (every zone's offset is a whole number of quarter hours), so that every worker
// renders the same text, and the same ETag, for the same data within it.
const FEED_BUCKET_MS = 15 * 60_000

const feedReplies = createReplyCache<string>(200)
const rendering = new Map<string, Promise<CachedReply<string>>>()

/** The person's feed as a prepared reply, from the cache when the data and the quarter hour are unchanged. */
export async function loadPersonFeedReply(db: AppDatabase, person: Person, homeUrl: string | null): Promise<CachedReply<string>> {
  const bucketMs = Math.floor(nowMs() / FEED_BUCKET_MS) * FEED_BUCKET_MS
  const key = `${person.id}|${readDataStamp(db)}|${bucketMs}|${homeUrl ?? ''}`
  const hit = feedReplies.get(key)
  if (hit) return hit
  let pending = rendering.get(key)
  if (!pending) {
    pending = renderPersonFeed(db, person, { nowMs: bucketMs, homeUrl })
      .then(text => feedReplies.set(key, prepareTextReply(text, 'text/calendar; charset=utf-8')))
      .finally(() => rendering.delete(key))
    rendering.set(key, pending)
  }
  return pending
}
