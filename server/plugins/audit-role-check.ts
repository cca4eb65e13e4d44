import { QueryTypes } from 'sequelize'

// The audit trail is append-only only if the app cannot switch its trigger off: say so at start when
// the app runs as the role that owns it (an install from before the two roles; README, production settings).
export default defineNitroPlugin(() => {
  useDb().sequelize.query<{ owns: boolean }>(
    'SELECT pg_has_role(current_user, relowner, \'USAGE\') AS owns FROM pg_class WHERE oid = \'audit_events\'::regclass',
    { type: QueryTypes.SELECT },
  ).then(([row]) => {
    if (row?.owns) console.warn('[audit] the app\'s database role owns audit_events and could alter or empty it: run the app as a role of its own (NUXT_DATABASE_URL) and migrate as the owner (NUXT_DATABASE_OWNER_URL)')
  }).catch((error: Error) => console.error('[audit] could not check who owns the audit trail:', error.message))
})
