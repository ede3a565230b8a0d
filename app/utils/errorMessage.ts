export const errorMessage = (err: unknown, fallback = 'Something went wrong') =>
  (err as { data?: { message?: string } })?.data?.message ?? fallback
