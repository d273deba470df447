// The service worker (made at build time by modules/service-worker.ts) keeps the run sheet working offline.
export default defineNuxtPlugin(() => {
  if (import.meta.dev || !('serviceWorker' in navigator)) return
  navigator.serviceWorker.register('/sw.js').catch(() => {})
})
