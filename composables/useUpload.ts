// Ticket attachments uploaded one file at a time as soon as they are picked, each with its own
// progress: XMLHttpRequest, because fetch reports no upload progress. The CSRF token goes in
// the header nuxt-csurf expects, as useApi() sends it. A file the server refuses keeps its
// row with the server's words; a pending upload can be removed (DELETE) until a message
// sends it.
import type { AttachmentView } from '~~/shared/types/tickets'
import { ATTACHMENTS_PER_MESSAGE } from '~~/shared/utils/tickets'

export interface UploadItem {
  /** Local key for the list. */
  key: number
  name: string
  size: number
  /** 0 to 1. */
  progress: number
  state: 'uploading' | 'done' | 'failed'
  error: string
  attachment: AttachmentView | null
}

let nextKey = 1

function errorOf(xhr: XMLHttpRequest): string {
  try {
    const body = JSON.parse(xhr.responseText) as {
      message?: string
      data?: { fields?: Record<string, string> }
    }
    return body.data?.fields?.file ?? body.message ?? 'The file could not be uploaded.'
  } catch {
    if (xhr.status === 413) return 'The file is too large.'
    return xhr.status
      ? 'The file could not be uploaded. Please try again.'
      : 'Tiltwright could not be reached. Check the connection and try again.'
  }
}

export function useUpload() {
  const items = ref<UploadItem[]>([])
  const api = useApi()

  async function send(item: UploadItem, file: File) {
    await ensureCsrfToken().catch(() => undefined)
    const { csrf, headerName } = useCsrf()
    const xhr = new XMLHttpRequest()
    xhr.open('POST', '/api/ticket-attachments')
    xhr.setRequestHeader(headerName, csrf ?? '')
    xhr.setRequestHeader('Accept', 'application/json')
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) item.progress = e.loaded / e.total
    }
    xhr.onload = () => {
      if (xhr.status === 201) {
        item.attachment = JSON.parse(xhr.responseText) as AttachmentView
        item.progress = 1
        item.state = 'done'
      } else {
        item.state = 'failed'
        item.error = errorOf(xhr)
      }
    }
    xhr.onerror = () => {
      item.state = 'failed'
      item.error = errorOf(xhr)
    }
    const form = new FormData()
    form.append('file', file, file.name)
    xhr.send(form)
  }

  /** Starts an upload for each file, up to the files a message may carry. */
  function add(files: FileList | File[]) {
    for (const file of Array.from(files)) {
      const kept = items.value.filter(i => i.state !== 'failed').length
      const item = reactive<UploadItem>({
        key: nextKey++,
        name: file.name,
        size: file.size,
        progress: 0,
        state: 'uploading',
        error: '',
        attachment: null,
      })
      items.value.push(item)
      if (kept >= ATTACHMENTS_PER_MESSAGE) {
        item.state = 'failed'
        item.error = `At most ${ATTACHMENTS_PER_MESSAGE} files a message.`
        continue
      }
      void send(item, file)
    }
  }

  async function remove(key: number) {
    const item = items.value.find(i => i.key === key)
    if (!item) return
    if (item.attachment) {
      try {
        await api(`/api/ticket-attachments/${item.attachment.id}`, { method: 'DELETE' })
      } catch (e) {
        item.error = toApiFailure(e).message
        return
      }
    }
    items.value = items.value.filter(i => i.key !== key)
  }

  const ids = computed(() =>
    items.value.flatMap(i => (i.state === 'done' && i.attachment ? [i.attachment.id] : [])),
  )
  const busy = computed(() => items.value.some(i => i.state === 'uploading'))
  /** After the message that sent them: the list starts empty again. */
  const clear = () => (items.value = [])
  return { items, ids, busy, add, remove, clear }
}
