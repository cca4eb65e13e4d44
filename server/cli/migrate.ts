import pg from 'pg'
import { Sequelize } from 'sequelize'
import { createMigrator } from '../db/migrator'

const url = process.env.NUXT_DATABASE_URL
if (!url) {
  console.error('NUXT_DATABASE_URL is not set')
  process.exit(1)
}
const sequelize = new Sequelize(url, { dialect: 'postgres', dialectModule: pg, logging: false })
try {
  const done = await createMigrator(sequelize).up()
  console.log(`[migrate] ${done.length ? done.map(m => m.name).join(', ') : 'up to date'}`)
}
finally {
  await sequelize.close()
}
