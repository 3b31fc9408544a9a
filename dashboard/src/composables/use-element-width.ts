import { onBeforeUnmount, onMounted, shallowRef, type Ref } from 'vue'

/** The content width of an element, kept current with a ResizeObserver; `fallback` until it is measured. */
export function useElementWidth(el: Readonly<Ref<HTMLElement | null | undefined>>, fallback = 640) {
  const width = shallowRef(fallback)
  let observer: ResizeObserver | undefined
  onMounted(() => {
    if (!el.value) return
    width.value = el.value.clientWidth || fallback
    observer = new ResizeObserver(entries => {
      const w = entries[0]?.contentRect.width
      if (w) width.value = Math.round(w)
    })
    observer.observe(el.value)
  })
  onBeforeUnmount(() => observer?.disconnect())
  return width
}
