import { Umzug, SequelizeStorage } from 'umzug'
import type { Sequelize } from 'sequelize'
import { fileURLToPath } from 'node:url'
import { dirname, join } from 'node:path'

const migrationsDir = join(dirname(fileURLToPath(import.meta.url)), 'migrations')

/** Migrations run from a script (server/cli/migrate.ts), never per request. */
export function createMigrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: { glob: ['*.ts', { cwd: migrationsDir }] },
    context: sequelize,
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  })
}
