/** Preferences that span pages and survive reloads (kept in a cookie so SSR renders them). */
export const usePrefsStore = defineStore('prefs', () => {
  const themeCookie = useCookie<'paper' | 'night'>('barsmith-theme', { default: () => 'paper', sameSite: 'lax', maxAge: 60 * 60 * 24 * 365 })
  const theme = computed(() => themeCookie.value)
  function toggleTheme() {
    themeCookie.value = themeCookie.value === 'night' ? 'paper' : 'night'
  }
  return { theme, toggleTheme }
})
