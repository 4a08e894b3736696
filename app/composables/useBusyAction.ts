// One mutation at a time from a button: `busy` while it runs, its refusal in words in `problem`.
export function useBusyAction() {
  const busy = ref(false)
  const problem = ref('')
  async function run(action: () => Promise<unknown>): Promise<boolean> {
    problem.value = ''
    busy.value = true
    try {
      await action()
      return true
    }
    catch (error) {
      problem.value = errorMessage(error)
      return false
    }
    finally {
      busy.value = false
    }
  }
  return { busy, problem, run }
}
