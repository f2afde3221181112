// Puts the server's "now" (the one clock, server/core/time/clock.ts) on each request, so that pages
// rendered on the server read the same instant as the API (composables/useNowMs.ts) rather than the
// machine's clock: under test the server's clock is the test clock.
export default defineEventHandler((event) => {
  event.context.gloamlineNowMs = nowMs()
})
