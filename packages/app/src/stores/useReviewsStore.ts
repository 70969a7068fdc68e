import { defineStore } from 'pinia';
import { ref } from 'vue';
import { releasesApi } from '../api/releasesApi.ts';
import type { WaitingReview } from '../api/types.ts';
import { useLoadState } from './loadState.ts';

/** The reviews that wait for the signed-in reviewer (releases in review, their link unused and unexpired). */
export const useReviewsStore = defineStore('reviews', () => {
  const waiting = ref<WaitingReview[]>([]);
  const { loading, error, track } = useLoadState();

  async function load(): Promise<void> {
    await track(async () => {
      waiting.value = await releasesApi.waitingReviews();
    });
  }

  return { waiting, loading, error, load };
});
