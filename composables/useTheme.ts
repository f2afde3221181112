/** Light or dark theme: follows the system until the person picks one, then remembers it. */
export function useTheme() {
  const choice = useCookie<'light' | 'dark' | 'system'>('gl-theme', { default: () => 'system', sameSite: 'lax' })
  const applied = computed(() => choice.value)
  useHead({
    htmlAttrs: { class: computed(() => (applied.value === 'dark' ? 'dark' : '')) },
    script: [{
      // before paint: apply the system preference when no explicit choice was made
      innerHTML: `(function(){try{var c=document.cookie.match(/gl-theme=(\\w+)/);var v=c?c[1]:'system';if(v==='dark'||(v==='system'&&matchMedia('(prefers-color-scheme: dark)').matches))document.documentElement.classList.add('dark')}catch(e){}})()`,
      tagPosition: 'head'
    }]
  })
  function cycle() {
    const isDark = import.meta.client && document.documentElement.classList.contains('dark')
    choice.value = isDark ? 'light' : 'dark'
    if (import.meta.client) document.documentElement.classList.toggle('dark', choice.value === 'dark')
  }
  return { choice, cycle }
}
