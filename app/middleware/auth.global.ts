// Every page but sign-in needs a session; a signed-out visitor returns to the page they asked for. The page is
// drawn in the person's own language when they chose one (users.language), on the server as on the device.
export default defineNuxtRouteMiddleware(async (to) => {
  const session = useSessionStore()
  if (to.meta.public) return
  if (!session.signedIn) await session.load()
  if (!session.signedIn) {
    return navigateTo({ path: '/sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  }
  const { $i18n } = useNuxtApp()
  const chosen = session.me?.user.language
  if (chosen && chosen !== $i18n.locale.value) await $i18n.setLocale(chosen)
})
