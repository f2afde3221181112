// Tells people of committed shift changes by mail (server/utils/notice-mail.ts decides who hears of
// what). The shift service announces after its transaction commits; a failed send never undoes it.
export default defineNitroPlugin(() => {
  onShiftChange(async (notice) => {
    await sendShiftChangeNotices(useDB(), notice, { baseUrl: resolvePublicBaseUrl() })
  })
})
