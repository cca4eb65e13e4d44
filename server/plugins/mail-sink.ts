export default defineNitroPlugin(async () => {
  const { mailSink, smtpUrl } = useRuntimeConfig()
  if (!mailSink.enabled || smtpUrl) return
  try {
    await startMailSink(Number(mailSink.port))
    console.log(`[mail] local mail sink listening on 127.0.0.1:${mailSink.port}`)
  }
  catch (error) {
    console.error(`[mail] could not start the local mail sink on port ${mailSink.port}:`, (error as Error).message)
  }
})
