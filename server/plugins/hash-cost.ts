// A password hash's work factor below scrypt's usual N = 2^14 is for the test server only, where hundreds of
// sign-ins would otherwise spend the machine's time: any other server refuses to start with it.
const SCRYPT_MIN_COST = 16384

export default defineNitroPlugin(() => {
  const config = useRuntimeConfig()
  const cost = Number(config.hash?.scrypt?.cost ?? SCRYPT_MIN_COST)
  if (cost < SCRYPT_MIN_COST && !config.testServer) {
    console.error(`[trapline] refusing to start: NUXT_HASH_SCRYPT_COST=${cost} is below ${SCRYPT_MIN_COST}; `
      + 'a cheaper password hash is for the test server only')
    process.exit(1)
  }
})
