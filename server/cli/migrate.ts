import pg from 'pg'
import { Sequelize } from 'sequelize'
import { grantAppRole, roleOf } from '../db/app-role'
import { createMigrator } from '../db/migrator'

// Migrations run as the schema's owner (NUXT_DATABASE_OWNER_URL); the app runs as NUXT_DATABASE_URL's role.
const appUrl = process.env.NUXT_DATABASE_URL
const ownerUrl = process.env.NUXT_DATABASE_OWNER_URL ?? appUrl
if (!appUrl || !ownerUrl) {
  console.error('NUXT_DATABASE_URL (the app\'s) and NUXT_DATABASE_OWNER_URL (the schema owner\'s) are not set')
  process.exit(1)
}
const sequelize = new Sequelize(ownerUrl, { dialect: 'postgres', dialectModule: pg, logging: false })
try {
  const done = await createMigrator(sequelize).up()
  console.log(`[migrate] ${done.length ? done.map(m => m.name).join(', ') : 'up to date'}`)
  if (roleOf(appUrl) === roleOf(ownerUrl)) {
    console.warn('[migrate] the app runs as the schema\'s owner, so it could alter or empty the audit trail: give it a role of its own (README, production settings)')
  }
  else {
    await grantAppRole(sequelize, roleOf(appUrl))
    console.log(`[migrate] the app's role ${roleOf(appUrl)} may use the tables; the audit trail it may only read and append to`)
  }
}
finally {
  await sequelize.close()
}
