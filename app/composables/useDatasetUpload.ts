export interface UploadFields {
  title: string
  sourceNote?: string
  sourceUrl?: string
  obtainedOn?: string
  /** The dataset this upload corrects. */
  replacesId?: string
}

export interface UploadOutcome {
  id: string
  status: string
}

/**
 * Sends a dataset with its provenance and reports the upload's progress. XMLHttpRequest is
 * used because fetch cannot report how much of a request body has been sent.
 */
export function useDatasetUpload(newsroomId: Ref<string>) {
  const progress = ref(0)
  const busy = ref(false)

  function upload(file: File, fields: UploadFields): Promise<UploadOutcome> {
    const form = new FormData()
    for (const [key, value] of Object.entries(fields)) if (value) form.append(key, value)
    form.append('file', file)
    busy.value = true
    progress.value = 0
    return new Promise<UploadOutcome>((resolve, reject) => {
      const request = new XMLHttpRequest()
      request.open('POST', `/api/datasets?newsroomId=${encodeURIComponent(newsroomId.value)}`)
      request.responseType = 'json'
      request.upload.onprogress = (event) => {
        if (event.lengthComputable) progress.value = event.loaded / event.total
      }
      request.onload = () => {
        if (request.status >= 200 && request.status < 300) resolve(request.response as UploadOutcome)
        else reject({ statusCode: request.status, data: request.response })
      }
      request.onerror = () => reject({ statusCode: 0, data: { statusMessage: 'The connection was lost during the upload. Try again.' } })
      request.send(form)
    }).finally(() => {
      busy.value = false
    })
  }

  return { progress: readonly(progress), busy: readonly(busy), upload }
}
