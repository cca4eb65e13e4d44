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

/** One query as the schema's owner (the role migrations run as), for what the app's own role may not do. */
export function ownerSql<R extends pg.QueryResultRow = any>(text: string, values: unknown[] = []): Promise<pg.QueryResult<R>> {
  const url = process.env.MANTISSA_TEST_OWNER_DATABASE_URL
  if (!url) throw new Error('MANTISSA_TEST_OWNER_DATABASE_URL is not set (npm test sets it)')
  return sql<R>(text, values, url)
}
