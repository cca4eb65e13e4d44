/**
 * Nothing typed is lost on the way out of the editor. Hidden (another tab, the phone's home screen)
 * or left (reload, Back, closing), the page sends what waits as keepalive requests, which the
 * browser completes after the page is gone; the browser asks before leaving while anything is
 * not saved. Leaving for another page of the app first saves, and asks only when that fails.
 */
export function useLeaveGuard() {
  const store = useDocumentStore()

  function onHidden() {
    if (document.visibilityState === 'hidden') store.sendBeforeLeaving()
  }
  function onBeforeUnload(event: BeforeUnloadEvent) {
    if (!store.unsaved) return
    event.preventDefault()
    // Older Chromium builds ask only when returnValue is set.
    event.returnValue = ''
  }
  const onPageHide = () => store.sendBeforeLeaving()

  onMounted(() => {
    document.addEventListener('visibilitychange', onHidden)
    window.addEventListener('beforeunload', onBeforeUnload)
    window.addEventListener('pagehide', onPageHide)
  })
  onBeforeUnmount(() => {
    document.removeEventListener('visibilitychange', onHidden)
    window.removeEventListener('beforeunload', onBeforeUnload)
    window.removeEventListener('pagehide', onPageHide)
  })

  onBeforeRouteLeave(async () => {
    if (!store.unsaved) return true
    await store.saveAll()
    if (!store.unsaved) return true
    return window.confirm('Some of your changes are not saved: they will be lost if you leave. Leave anyway?')
  })
}
