import { DEMO_NEWSROOM, DEMO_PASSWORD, DEMO_PEOPLE } from './people'

/**
 * Seeds the invented demo newsroom when the database holds no newsroom yet. An advisory
 * lock keeps two app servers starting together from seeding twice.
 */
export async function seedDemoIfEmpty(): Promise<boolean> {
  const { sequelize, models } = useDb()
  return sequelize.transaction(async (transaction) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(4242001)', { transaction })
    if (await models.Newsroom.count({ transaction }) > 0) return false
    const newsroom = await models.Newsroom.create({ name: DEMO_NEWSROOM }, { transaction })
    const passwordHash = await hashPassword(DEMO_PASSWORD)
    for (const person of DEMO_PEOPLE) {
      const user = await models.User.create({ name: person.name, email: person.email, passwordHash }, { transaction })
      await models.Membership.create({ newsroomId: newsroom.id, userId: user.id, role: person.role }, { transaction })
    }
    return true
  })
}
