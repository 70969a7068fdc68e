import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import { estimatesApi } from '../api/estimatesApi.ts';
import type { CandidateEstimate } from '../api/types.ts';
import { errorText } from '../lib/errorText.ts';
import { ESTIMATE_REQUEST_MAX_SPECS } from '@loopwright/contract';
import type { WidthCandidate } from '../components/widthCostView.ts';

/**
 * The server's yosys estimate of each width the search tried. The server answers from its cache or
 * queues the synthesis for a background worker; this store asks again every few seconds until every
 * candidate has an answer. A newer search replaces the older one's requests.
 */
export const useWidthCostStore = defineStore('widthCost', () => {
  const costs = shallowRef<(CandidateEstimate | undefined)[]>([]);
  const error = ref('');
  let generation = 0;

  async function follow(candidates: readonly WidthCandidate[], intervalMs = 3000): Promise<void> {
    const mine = ++generation;
    costs.value = candidates.map(() => undefined);
    error.value = '';
    const specs = candidates.map((c) => c.spec).slice(0, ESTIMATE_REQUEST_MAX_SPECS);
    try {
      for (;;) {
        const answers = await estimatesApi.candidates(specs);
        if (mine !== generation) return;
        costs.value = candidates.map((_, i): CandidateEstimate | undefined =>
          i < ESTIMATE_REQUEST_MAX_SPECS ? answers[i] : { state: 'not-estimated', reason: `only the first ${ESTIMATE_REQUEST_MAX_SPECS} widths are estimated` },
        );
        if (!answers.some((a) => a.state === 'pending')) return;
        await new Promise((resolve) => setTimeout(resolve, intervalMs));
        if (mine !== generation) return;
      }
    } catch (cause) {
      if (mine === generation) error.value = errorText(cause);
    }
  }

  return { costs, error, follow };
});
