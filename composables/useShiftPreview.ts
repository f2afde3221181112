import type { Ref } from 'vue'
import { validateShiftDraft, type ShiftCheckReply, type ShiftDraft } from '#shared/planning'

/** The live light check and conflicts of a draft, from POST /api/shifts/check, a moment after each edit. */
export function useShiftPreview(draft: Ref<ShiftDraft>, shiftId: Ref<number | null>) {
  const check = ref<ShiftCheckReply | null>(null)
  const loading = ref(false)
  const error = ref('')
  let timer: ReturnType<typeof setTimeout> | undefined
  let asked = 0

  async function run() {
    const errors = validateShiftDraft(draft.value)
    delete errors.title
    if (Object.keys(errors).length) {
      check.value = null
      error.value = 'The light check appears once the site, start and end are filled in.'
      return
    }
    const mine = ++asked
    loading.value = true
    try {
      const reply = await $fetch<ShiftCheckReply>('/api/shifts/check', {
        method: 'POST',
        body: { ...draft.value, title: draft.value.title.trim() || 'Draft', overrideReason: undefined, shiftId: shiftId.value ?? undefined }
      })
      if (mine !== asked) return
      check.value = reply
      error.value = ''
    } catch (err) {
      if (mine !== asked) return
      check.value = null
      error.value = describeFetchError(err)
    } finally {
      if (mine === asked) loading.value = false
    }
  }

  watch(draft, () => {
    clearTimeout(timer)
    timer = setTimeout(run, 350)
  }, { deep: true, immediate: true })
  onBeforeUnmount(() => clearTimeout(timer))

  return { check, loading, error, run }
}
