// For load balancers and the start script: answers 200 once the database answers.
export default defineEventHandler(async () => {
  await useDb().sequelize.query('SELECT 1')
  return { ok: true }
})
