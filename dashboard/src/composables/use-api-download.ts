import { shallowRef } from 'vue'
import { ApiError } from '../api/client'
import { fetchFile } from '../api/imports'
import { message } from '../utils/discrete'
import { downloadBlob } from '../utils/download'

/** Downloads a file from the API; a refusal or a network failure is shown to the user, never swallowed. */
export function useApiDownload() {
  /** The address being downloaded, so its button can show a spinner. */
  const busy = shallowRef<string>()
  async function download(url: string, fallbackName: string) {
    busy.value = url
    try {
      const { blob, fileName } = await fetchFile(url, fallbackName)
      downloadBlob(fileName, blob)
    } catch (e) {
      message.error(e instanceof ApiError ? e.message : `${fallbackName} could not be downloaded.`)
    } finally {
      if (busy.value === url) busy.value = undefined
    }
  }
  return { busy, download }
}
