// Creates a newsroom and an admin invitation on a running database, for the first admin of
// a fresh installation: `npm run newsroom:create -- "Newsroom name" admin@example.org`.
import { QueryTypes } from 'sequelize'
import { storeInvitation } from '../services/invitations'
import { openDb } from '../utils/db'

export async function createNewsroomWithAdminInvitation(databaseUrl: string, name: string, email: string) {
  const { sequelize, models } = openDb(databaseUrl)
  return sequelize.transaction(async (transaction) => {
    const newsroom = await models.Newsroom.create({ name }, { transaction })
    // An invitation needs an inviter: a system account that can never sign in (its hash matches no password).
    const [system] = await sequelize.query<{ id: string }>(
      `INSERT INTO users (email, name, password_hash) VALUES ('system@mantissa.invalid', 'Mantissa setup', '!')
       ON CONFLICT (email) DO UPDATE SET name = EXCLUDED.name RETURNING id`,
      { type: QueryTypes.SELECT, transaction },
    )
    const { token } = await storeInvitation({ newsroomId: newsroom.id, email: email.trim().toLowerCase(), role: 'admin', invitedBy: system!.id }, transaction)
    return { newsroomId: newsroom.id, token }
  })
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const [name, email] = process.argv.slice(2)
  const url = process.env.NUXT_DATABASE_URL
  if (!name || !email || !url) {
    console.error('usage: NUXT_DATABASE_URL=… npm run newsroom:create -- "Newsroom name" admin@example.org')
    process.exit(2)
  }
  const { token } = await createNewsroomWithAdminInvitation(url, name, email)
  await openDb(url).sequelize.close()
  console.log(`Newsroom "${name}" created. The first admin joins at: ${process.env.NUXT_PUBLIC_URL ?? 'http://localhost:3000'}/join/${token}`)
}
