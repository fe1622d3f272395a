/** The message a page shows for a failed request: the server's words when it sent any. */
export function errorMessage(error: unknown, fallback = 'Something went wrong. Try again.'): string {
  if (error && typeof error === 'object') {
    const data = (error as { data?: { message?: unknown } }).data
    if (data && typeof data.message === 'string' && data.message) return data.message
  }
  return fallback
}

/** The field a 400 names, for marking the input. */
export function errorField(error: unknown): string | undefined {
  const data = (error as { data?: { data?: { field?: unknown } } } | null)?.data?.data
  return typeof data?.field === 'string' ? data.field : undefined
}
