// For load balancers and the start script: 200 once startup work is done and the database answers.
export default defineEventHandler(async () => {
  await startupSettled()
  await useDb().sequelize.query('SELECT 1')
  return { ok: true }
})
