import type { Ref } from 'vue'

/**
 * Keeps what was typed (or filled in by the browser) into a server-rendered form before the app took over on a
 * slow network: hydrating `v-model` would set each field back to its empty value. `fields` maps each input's
 * `name` to its model.
 */
export function useTypedBeforeHydration(fields: Record<string, Ref<string>>) {
  if (import.meta.server || !useNuxtApp().isHydrating) return
  onBeforeMount(() => {
    for (const [name, model] of Object.entries(fields)) {
      const typed = document.querySelector<HTMLInputElement>(`input[name="${name}"]`)?.value
      if (typed && !model.value) model.value = typed
    }
  })
}
