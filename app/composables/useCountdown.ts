/** Seconds left until a deadline, ticking every second, corrected by the server's clock. */
export function useCountdown(deadline: Ref<string | null | undefined>, serverNow: Ref<string | null | undefined>) {
  const skewMs = computed(() => (serverNow.value ? Date.parse(serverNow.value) - Date.now() : 0))
  const now = ref(Date.now())
  let timer: ReturnType<typeof setInterval> | undefined
  onMounted(() => {
    timer = setInterval(() => {
      now.value = Date.now()
    }, 1000)
  })
  onBeforeUnmount(() => clearInterval(timer))
  const secondsLeft = computed(() =>
    deadline.value ? Math.floor((Date.parse(deadline.value) - (now.value + skewMs.value)) / 1000) : null,
  )
  const text = computed(() => {
    const s = secondsLeft.value
    if (s === null) return ''
    if (s <= 0) return 'closed'
    const h = Math.floor(s / 3600)
    const m = Math.floor((s % 3600) / 60)
    const sec = s % 60
    return `${h ? `${h} h ` : ''}${String(m).padStart(h ? 2 : 1, '0')} min ${String(sec).padStart(2, '0')} s`
  })
  return { secondsLeft, text }
}
