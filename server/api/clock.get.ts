// public route: the server's clock to the millisecond, for a device to measure its own clock against.
export default defineEventHandler((event) => {
  setHeader(event, 'cache-control', 'no-store')
  return { now: new Date().toISOString() }
})
