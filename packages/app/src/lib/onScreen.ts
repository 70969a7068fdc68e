import { onBeforeUnmount, onMounted, ref, type Ref } from 'vue';

/**
 * Whether an element is on screen: in the viewport and not clipped away by a scrolling ancestor or
 * inside a tab that is not shown (display: none never intersects). True until the browser says
 * otherwise, and always true where IntersectionObserver is missing, so nothing is ever held back
 * without a reason. `marginPx` counts an element that close to the edge as on screen already, so it
 * is drawn before it scrolls in.
 */
export function useOnScreen(target: Ref<HTMLElement | null>, marginPx = 200): Ref<boolean> {
  const onScreen = ref(true);
  let observer: IntersectionObserver | null = null;
  onMounted(() => {
    if (typeof IntersectionObserver !== 'function' || !target.value) return;
    observer = new IntersectionObserver(
      (entries) => {
        const last = entries[entries.length - 1];
        if (last) onScreen.value = last.isIntersecting;
      },
      { rootMargin: `${marginPx}px` },
    );
    observer.observe(target.value);
  });
  onBeforeUnmount(() => observer?.disconnect());
  return onScreen;
}
