// Creates a newsroom and an admin invitation on a running database, for the first admin of
// a fresh installation: `npm run newsroom:create -- "Newsroom name" admin@example.org`.
import { createHash, randomBytes } from 'node:crypto'
import pg from 'pg'

export async function createNewsroomWithAdminInvitation(databaseUrl: string, name: string, email: string) {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  try {
    await client.query('BEGIN')
    const token = randomBytes(32).toString('base64url')
    const tokenHash = createHash('sha256').update(token).digest('hex')
    const { rows: [newsroom] } = await client.query('INSERT INTO newsrooms (name) VALUES ($1) RETURNING id', [name])
    // An invitation needs an inviter: a system account that can never sign in (its hash matches no password).
    const { rows: [system] } = await client.query(
      `INSERT INTO users (email, name, password_hash) VALUES ('system@mantissa.invalid', 'Mantissa setup', '!')
       ON CONFLICT (email) DO UPDATE SET name = EXCLUDED.name RETURNING id`,
    )
    await client.query(
      `INSERT INTO invitations (newsroom_id, email, role, token_hash, invited_by, expires_at)
       VALUES ($1, $2, 'admin', $3, $4, now() + interval '7 days')`,
      [newsroom.id, email.trim().toLowerCase(), tokenHash, system.id],
    )
    await client.query('COMMIT')
    return { newsroomId: newsroom.id as string, token }
  }
  catch (error) {
    await client.query('ROLLBACK')
    throw error
  }
  finally {
    await client.end()
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const [name, email] = process.argv.slice(2)
  const url = process.env.NUXT_DATABASE_URL
  if (!name || !email || !url) {
    console.error('usage: NUXT_DATABASE_URL=… npm run newsroom:create -- "Newsroom name" admin@example.org')
    process.exit(2)
  }
  const { token } = await createNewsroomWithAdminInvitation(url, name, email)
  console.log(`Newsroom "${name}" created. The first admin joins at: ${process.env.NUXT_PUBLIC_URL ?? 'http://localhost:3000'}/join/${token}`)
}
