export interface Notice { tone: 'success' | 'warning' | 'error', text: string }

/** The page's one status line, shared by the components that act on it. */
export function useNotice() {
  const notice = useState<Notice | null>('gl-notice', () => null)
  function say(text: string, tone: Notice['tone'] = 'success') {
    notice.value = { text, tone }
  }
  function dismiss() {
    notice.value = null
  }
  return { notice, say, dismiss }
}
