import pg from 'pg'

/** One query on the test PostgreSQL (NUXT_DATABASE_URL), for facts the API does not show. */
export async function sql<R extends pg.QueryResultRow = any>(text: string, values: unknown[] = []): Promise<pg.QueryResult<R>> {
  const client = new pg.Client({ connectionString: process.env.NUXT_DATABASE_URL })
  await client.connect()
  try {
    return await client.query<R>(text, values)
  }
  finally {
    await client.end()
  }
}
