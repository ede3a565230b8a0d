import type { UploadEvent, UploadSummary } from '#shared/types/upload'

/**
 * Sends a CSV file to the import route with XMLHttpRequest: upload.onprogress gives bytes sent
 * (fetch has no upload progress), and the NDJSON answer is read line by line as it arrives.
 */
export function useCsvUpload() {
  const running = ref(false)
  const bytesSent = ref(0)
  const bytesTotal = ref(0)
  const rowsRead = ref(0)
  const summary = ref<UploadSummary | null>(null)
  const error = ref('')

  function start(file: File, query: Record<string, string>): Promise<void> {
    running.value = true
    bytesSent.value = rowsRead.value = 0
    bytesTotal.value = file.size
    summary.value = null
    error.value = ''
    const xhr = new XMLHttpRequest()
    let consumed = 0
    const readLines = () => {
      const text = xhr.responseText
      const end = text.lastIndexOf('\n') + 1
      for (const line of text.slice(consumed, end).split('\n').filter(Boolean)) {
        const event = JSON.parse(line) as UploadEvent
        if (event.type === 'progress') rowsRead.value = event.rowsRead
        else {
          summary.value = event.summary
          rowsRead.value = event.summary.rowsRead
          if (event.type === 'error') error.value = event.message
        }
      }
      consumed = end
    }
    return new Promise((resolve) => {
      const done = () => {
        running.value = false
        resolve()
      }
      xhr.open('POST', `/api/uploads/import?${new URLSearchParams(query)}`)
      xhr.setRequestHeader('content-type', 'text/csv')
      xhr.upload.onprogress = (e) => { bytesSent.value = e.loaded }
      xhr.onprogress = () => { if (xhr.status === 200) readLines() }
      xhr.onload = () => {
        if (xhr.status === 200) {
          bytesSent.value = bytesTotal.value
          readLines()
          if (!summary.value) error.value = 'The server ended the import without a summary; check the stored data before importing again.'
        }
        else {
          error.value = errorMessage({ data: safeJson(xhr.responseText) }, `The server answered ${xhr.status}`)
        }
        done()
      }
      xhr.onerror = () => {
        error.value = 'The connection failed during the upload. Batches already committed stay stored; importing the file again is safe.'
        done()
      }
      xhr.send(file)
    })
  }

  return { running, bytesSent, bytesTotal, rowsRead, summary, error, start }
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text)
  }
  catch {
    return undefined
  }
}
