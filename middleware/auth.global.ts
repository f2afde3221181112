// Convenience only: the server checks the session and role on every route.
export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn } = useUserSession()
  const open = to.meta.public === true
  if (!open && !loggedIn.value) {
    return navigateTo({ path: '/login', query: to.fullPath !== '/' ? { redirect: to.fullPath } : {} })
  }
  if (to.path === '/login' && loggedIn.value) return navigateTo('/')
})
