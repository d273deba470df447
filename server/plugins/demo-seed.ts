export default defineNitroPlugin(() => {
  const { seedDemo } = useRuntimeConfig()
  if (seedDemo === true || String(seedDemo) === 'true') startDemoSeed()
})
