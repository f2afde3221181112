// Signs this browser out: the server-side session ends, so a copy of the cookie stops working too.
export default defineEventHandler(async (event) => {
  await endCurrentSession(event)
  return { ok: true }
})
