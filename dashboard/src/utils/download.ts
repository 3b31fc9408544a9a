/** Hand a text file to the browser as a download (a Blob URL, released right after). */
export function downloadText(fileName: string, text: string, type = 'text/csv;charset=utf-8') {
  downloadBlob(fileName, new Blob([text], { type }))
}

/** Hand any Blob to the browser as a download under `fileName`. */
export function downloadBlob(fileName: string, blob: Blob) {
  const url = URL.createObjectURL(blob)
  const a = document.createElement('a')
  a.href = url
  a.download = fileName
  a.style.display = 'none'
  document.body.appendChild(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 1000)
}
