// Mail that could not be sent (the mail server down) is tried again every little while.
export default defineNitroPlugin((nitro) => {
  const seconds = Number(useRuntimeConfig().mailRetrySeconds) || 30
  const timer = setInterval(() => {
    deliver().catch(() => {})
  }, seconds * 1000)
  timer.unref()
  nitro.hooks.hook('close', () => clearInterval(timer))
})
