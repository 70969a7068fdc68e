import { ref } from 'vue';

/**
 * The loading flag and the error of a store's load: set while the work runs, the error of the last
 * run kept for the view to describe (one place for what every list store did by hand).
 */
export function useLoadState() {
  const loading = ref(false);
  const error = ref<unknown>(null);

  async function track(work: () => Promise<void>): Promise<void> {
    loading.value = true;
    error.value = null;
    try {
      await work();
    } catch (cause) {
      error.value = cause;
    } finally {
      loading.value = false;
    }
  }

  return { loading, error, track };
}
