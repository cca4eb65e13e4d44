import type { Client } from './api'

/** Uploads CSV text as a dataset through the API and returns its id; fails unless it imported. */
export async function uploadCsv(client: Client, newsroomId: string, csv: string, title = 'Fixture'): Promise<string> {
  const form = new FormData()
  form.append('title', title)
  form.append('file', new Blob([csv], { type: 'text/csv' }), `${title.replace(/\W+/g, '-')}.csv`)
  const reply = await client.request('POST', `/api/datasets?newsroomId=${newsroomId}`, form)
  if (reply.status !== 201) throw new Error(`upload answered ${reply.status}: ${JSON.stringify(reply.body)}`)
  return reply.body.id
}
