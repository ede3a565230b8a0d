/** Hands text (or a blob the server sent) to the browser as a file download. */
export function saveTextFile(name: string, text: string | Blob, type = 'text/csv') {
  const link = document.createElement('a')
  link.href = URL.createObjectURL(typeof text === 'string' ? new Blob([text], { type }) : text)
  link.download = name
  link.click()
  URL.revokeObjectURL(link.href)
}
