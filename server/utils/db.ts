import pg from 'pg'
import { QueryTypes, Sequelize } from 'sequelize'
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
  const sequelize = connect(url)
  models.setupModels(sequelize)
  db = { sequelize, models }
  return db
}

function connect(url: string): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    // Digit counts are short aggregations whose row estimates across partitions run wild; JIT
    // compilation then costs more than the query (measured: 2.5 s of 5.6 s on a million rows).
    dialectOptions: { options: '-c jit=off' },
    pool: { max: 20, min: 0, idle: 10_000, acquire: 30_000 },
  })
}

let replica: Sequelize | null | undefined
/** Datasets the replica has been seen to hold ready (a ready dataset never changes). */
const onReplica = new Set<string>()
const REMEMBERED = 10_000

/**
 * Where the rows and digit records of a dataset are read: a read-only streaming replica when
 * NUXT_DATABASE_READ_URL names one and it has replayed the dataset's import, else the primary.
 * The import makes a dataset "ready" in the same transaction that attaches its rows, so a replica
 * that shows it ready holds all of it; one that lags behind is passed over, never half-read.
 */
export async function datasetReader(datasetId: string): Promise<Sequelize> {
  if (replica === undefined) {
    const url = useRuntimeConfig().databaseReadUrl
    replica = url ? connect(url) : null
  }
  if (!replica) return useDb().sequelize
  if (onReplica.has(datasetId)) return replica
  try {
    const [row] = await replica.query<{ ready: boolean }>(`SELECT true AS ready FROM datasets WHERE id = :datasetId AND status = 'ready'`, { replacements: { datasetId }, type: QueryTypes.SELECT })
    if (!row) return useDb().sequelize
  }
  catch (error) {
    // A replica out of reach slows nothing down: the primary answers.
    console.warn(`[db] read replica not used: ${(error as Error).message}`)
    return useDb().sequelize
  }
  if (onReplica.size >= REMEMBERED) onReplica.clear()
  onReplica.add(datasetId)
  return replica
}
