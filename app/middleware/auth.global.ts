// Every page but sign-in needs a session; a signed-out visitor returns to the page they asked for.
export default defineNuxtRouteMiddleware(async (to) => {
  const session = useSessionStore()
  if (to.meta.public) return
  if (!session.signedIn) await session.load()
  if (!session.signedIn) {
    return navigateTo({ path: '/sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  }
})
