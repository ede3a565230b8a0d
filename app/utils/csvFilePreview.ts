import type { UploadPreview } from '#shared/types/upload'

/** The browser sends only the start of a file for its preview; the upload streams the rest. */
export const PREVIEW_SLICE_BYTES = 64 * 1024

/** The server's reading of the start of a CSV file: its delimiter, header, first rows and column guesses. */
export async function previewCsvFile(file: File, siteId: number): Promise<UploadPreview> {
  const head = await file.slice(0, PREVIEW_SLICE_BYTES).text()
  return $fetch<UploadPreview>('/api/uploads/preview', {
    method: 'POST', query: { siteId, complete: file.size <= PREVIEW_SLICE_BYTES ? '1' : '0' }, body: head, headers: { 'content-type': 'text/csv' },
  })
}
