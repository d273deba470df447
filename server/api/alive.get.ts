// public route: liveness. The process answers; nothing else is asked (a database down makes a server not
// ready, not dead: restarting it would not help).
export default defineEventHandler((event) => {
  setResponseHeader(event, 'cache-control', 'no-store')
  return { ok: true }
})
