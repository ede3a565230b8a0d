/** Hands text to the browser as a file download (nothing leaves the browser). */
export function saveTextFile(name: string, text: string, type = 'text/csv') {
  const link = document.createElement('a')
  link.href = URL.createObjectURL(new Blob([text], { type }))
  link.download = name
  link.click()
  URL.revokeObjectURL(link.href)
}
