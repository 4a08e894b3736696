import { defineStore } from 'pinia'

// Short confirmations ("Saved.") shown at the bottom of the screen.
export const useToastStore = defineStore('toast', () => {
  const message = ref<string | null>(null)
  const tone = ref<'safe' | 'danger'>('safe')
  let timer: ReturnType<typeof setTimeout> | undefined

  function show(text: string, kind: 'safe' | 'danger' = 'safe') {
    message.value = text
    tone.value = kind
    clearTimeout(timer)
    timer = setTimeout(() => {
      message.value = null
    }, 3500)
  }

  return { message, tone, show }
})
