import { defineStore } from 'pinia';
import { ref } from 'vue';
import { releasesApi } from '../api/releasesApi.ts';
import type { WaitingReview } from '../api/types.ts';

/** The reviews that wait for the signed-in reviewer (releases in review, their link unused and unexpired). */
export const useReviewsStore = defineStore('reviews', () => {
  const waiting = ref<WaitingReview[]>([]);
  const loading = ref(false);
  const error = ref<unknown>(null);

  async function load(): Promise<void> {
    loading.value = true;
    error.value = null;
    try {
      waiting.value = await releasesApi.waitingReviews();
    } catch (cause) {
      error.value = cause;
    } finally {
      loading.value = false;
    }
  }

  return { waiting, loading, error, load };
});
