import pg from 'pg'

/** One query on the test PostgreSQL (NUXT_DATABASE_URL, or the fault tests' own), for facts the API does not show. */
export async function sql<R extends pg.QueryResultRow = any>(text: string, values: unknown[] = [], url = process.env.NUXT_DATABASE_URL): Promise<pg.QueryResult<R>> {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    return await client.query<R>(text, values)
  }
  finally {
    await client.end()
  }
}
