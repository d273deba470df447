import { defineStore } from 'pinia'

/** The units speeds are shown in. */
export type DisplayUnit = 'km/h' | 'mph'

/** Display choices that stick across visits (kept in cookies so the server renders them too). */
export const usePreferencesStore = defineStore('preferences', () => {
  const unitCookie = useCookie<DisplayUnit>('trapline-unit', {
    default: () => 'km/h',
    maxAge: 60 * 60 * 24 * 365,
    sameSite: 'lax',
  })
  const themeCookie = useCookie<'day' | 'dark'>('trapline-theme', {
    default: () => 'day',
    maxAge: 60 * 60 * 24 * 365,
    sameSite: 'lax',
  })
  const unit = computed({
    get: () => unitCookie.value,
    set: (v) => {
      unitCookie.value = v
    },
  })
  const theme = computed(() => themeCookie.value)
  const toggleTheme = () => {
    themeCookie.value = themeCookie.value === 'dark' ? 'day' : 'dark'
  }
  return { unit, theme, toggleTheme }
})
