// One mutation at a time from a button: `busy` while it runs, its refusal in words in `problem`.
export function useBusyAction() {
  const busy = ref(false)
  const problem = ref('')
  const { refusalText } = useReasonWords()
  async function run(action: () => Promise<unknown>): Promise<boolean> {
    problem.value = ''
    busy.value = true
    try {
      await action()
      return true
    }
    catch (error) {
      // a coded refusal in the reader's language; the server's words otherwise
      const refused = parseRefusal(error)
      problem.value = refused ? refusalText(refused) : errorMessage(error)
      return false
    }
    finally {
      busy.value = false
    }
  }
  return { busy, problem, run }
}
