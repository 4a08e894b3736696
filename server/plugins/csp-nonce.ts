// Puts the request's CSP nonce on every script tag Nuxt renders (the inline payload and config scripts).
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('render:html', (html, { event }) => {
    const nonce = event.context.cspNonce as string | undefined
    if (!nonce) return
    const add = (chunks: string[]) => chunks.map(c => c.replace(/<script(?![^>]*\bnonce=)/g, `<script nonce="${nonce}"`))
    html.head = add(html.head)
    html.bodyPrepend = add(html.bodyPrepend)
    html.body = add(html.body)
    html.bodyAppend = add(html.bodyAppend)
  })
})
