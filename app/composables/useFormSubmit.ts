/**
 * The error state of a form that calls the server: the message to show and the field a 400
 * names (for aria-invalid). `run` clears both, awaits the action and catches its error.
 */
export function useFormSubmit() {
  const error = ref('')
  const errorOn = ref<string>()
  const busy = ref(false)
  async function run<T>(action: () => Promise<T>): Promise<T | undefined> {
    error.value = ''
    errorOn.value = undefined
    busy.value = true
    try {
      return await action()
    }
    catch (e) {
      error.value = errorMessage(e)
      errorOn.value = errorField(e)
      return undefined
    }
    finally {
      busy.value = false
    }
  }
  return { error, errorOn, busy, run }
}
