import type { Sequelize } from 'sequelize'

/** The tables the app attaches each import's partitions to: ATTACH PARTITION needs their owner. */
const PARTITIONED = ['dataset_rows', 'digit_records', 'digit_cube']

/**
 * Gives the app's role what it may use, after every migration run (so new tables are covered):
 * reading and writing the tables, making its import tables and its job queue's schema, owning the
 * partitioned tables it attaches imports to. The audit trail and the blocks' versions it may only read and append to: it
 * owns none of it, so it cannot alter the table, disable its trigger, truncate, update or delete.
 * Also hands the app what it made while it ran as the owner (an install from before the two roles).
 */
export async function grantAppRole(sequelize: Sequelize, appRole: string) {
  const quote = (name: string) => sequelize.getQueryInterface().quoteIdentifier(name)
  const app = quote(appRole)
  const [[current]] = await sequelize.query('SELECT current_database() AS name') as [{ name: string }[], unknown]
  await sequelize.query(`
    GRANT CONNECT, TEMPORARY, CREATE ON DATABASE ${quote(current!.name)} TO ${app};
    GRANT USAGE, CREATE ON SCHEMA public TO ${app};
    GRANT SELECT, INSERT, UPDATE, DELETE, REFERENCES ON ALL TABLES IN SCHEMA public TO ${app};
    GRANT USAGE, SELECT, UPDATE ON ALL SEQUENCES IN SCHEMA public TO ${app};
    REVOKE ALL ON audit_events FROM ${app};
    GRANT SELECT, INSERT ON audit_events TO ${app};
    -- Drawing the next id is all an insert needs; setval could rewind the trail's ids under old events.
    REVOKE UPDATE ON SEQUENCE audit_events_id_seq FROM ${app};
    REVOKE ALL ON block_versions FROM ${app};
    GRANT SELECT, INSERT ON block_versions TO ${app};
    REVOKE ALL ON schema_migrations FROM ${app};
    GRANT SELECT ON schema_migrations TO ${app};
  `)
  await sequelize.query(`
    DO $own$
    DECLARE
      app regrole := ${sequelize.escape(appRole)}::regrole;
      item record;
    BEGIN
      -- The partitioned tables and every partition attached to them before.
      FOR item IN
        SELECT c.oid::regclass AS name FROM pg_class c
        WHERE c.relowner <> app AND (c.oid IN (${PARTITIONED.map(t => `'${t}'::regclass`).join(', ')})
          OR c.oid IN (SELECT inhrelid FROM pg_inherits WHERE inhparent IN (${PARTITIONED.map(t => `'${t}'::regclass`).join(', ')})))
      LOOP
        EXECUTE format('ALTER TABLE %s OWNER TO %I', item.name, app);
      END LOOP;
      -- Schemas the app made for itself (the job queue's), with what is in them.
      FOR item IN
        SELECT n.nspname FROM pg_namespace n
        WHERE n.nspowner = (SELECT oid FROM pg_roles WHERE rolname = current_user) AND n.nspname NOT IN ('public', 'information_schema') AND n.nspname NOT LIKE 'pg\\_%'
      LOOP
        EXECUTE format('ALTER SCHEMA %I OWNER TO %I', item.nspname, app);
        EXECUTE format('GRANT ALL ON ALL TABLES IN SCHEMA %I TO %I', item.nspname, app);
        EXECUTE format('GRANT ALL ON ALL SEQUENCES IN SCHEMA %I TO %I', item.nspname, app);
        EXECUTE format('GRANT ALL ON ALL ROUTINES IN SCHEMA %I TO %I', item.nspname, app);
      END LOOP;
    END $own$;
  `)
}

/** The user name in a PostgreSQL URL. */
export function roleOf(url: string): string {
  return decodeURIComponent(new URL(url).username)
}
