// Marks the page once Vue has taken over the server-rendered HTML (<html data-hydrated>): text typed into a form
// before then is replaced by the form's own values, so the browser tests wait for it before they type.
export default defineNuxtPlugin((nuxtApp) => {
  nuxtApp.hooks.hookOnce('app:suspense:resolve', () => {
    document.documentElement.dataset.hydrated = ''
  })
})
