import pg from 'pg'
import { Sequelize } from 'sequelize'
import * as models from '../models'

export interface Db {
  sequelize: Sequelize
  models: Omit<typeof models, 'setupModels'>
}

let db: Db | undefined

/**
 * The one database handle of the process, created on first use. The URL comes from
 * runtime config (NUXT_DATABASE_URL); `pg` is passed explicitly because Nitro's file
 * tracer misses Sequelize's dynamic require of it.
 */
export function useDb(): Db {
  return db ?? openDb(useRuntimeConfig().databaseUrl)
}

/**
 * Opens the process's handle on `url` outside the app (the command-line scripts, the tests'
 * helpers), so that the services they call reach the same database through `useDb`.
 */
export function openDb(url: string): Db {
  if (db) return db
  if (!url) throw new Error('NUXT_DATABASE_URL is not set')
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    // Digit counts are short aggregations whose row estimates across partitions run wild; JIT
    // compilation then costs more than the query (measured: 2.5 s of 5.6 s on a million rows).
    dialectOptions: { options: '-c jit=off' },
    pool: { max: 20, min: 0, idle: 10_000, acquire: 30_000 },
  })
  models.setupModels(sequelize)
  db = { sequelize, models }
  return db
}
