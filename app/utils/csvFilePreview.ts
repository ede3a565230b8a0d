import type { UploadPreview } from '#shared/types/upload'

/** The browser sends only the start of a file for its preview; the upload streams the rest. */
export const PREVIEW_SLICE_BYTES = 64 * 1024

/**
 * The server's reading of the start of a CSV file (its delimiter, header, first rows and column
 * guesses), and the bytes per line of that start, from which a progress bar estimates the rows.
 */
export async function previewCsvFile(file: File, siteId: number): Promise<{ preview: UploadPreview, bytesPerLine: number }> {
  const head = await file.slice(0, PREVIEW_SLICE_BYTES).text()
  const preview = await $fetch<UploadPreview>('/api/uploads/preview', {
    method: 'POST', query: { siteId, complete: file.size <= PREVIEW_SLICE_BYTES ? '1' : '0' }, body: head, headers: { 'content-type': 'text/csv' },
  })
  return { preview, bytesPerLine: new Blob([head]).size / Math.max(1, head.split('\n').length - 1) }
}
