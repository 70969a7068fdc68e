import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import { designsApi } from '../api/designsApi.ts';
import { ApiError } from '../api/client.ts';
import type { Design } from '../api/types.ts';
import { draftToSpec, specToDraft, type SpecDraft } from '../form/specDraft.ts';
import { checkDraft } from '../form/specValidation.ts';
import { threeWay, type ThreeWayChange } from '../lib/specDiff.ts';
import { filterSwitchEdits } from '../form/filterSwitch.ts';
import { useLoadState } from './loadState.ts';

export interface SaveConflict {
  readonly theirs: Design;
  readonly changes: readonly ThreeWayChange[];
}

/** The design being edited: stored record, the user's draft, saving with revision checks. */
export const useDesignStore = defineStore('design', () => {
  const design = ref<Design | null>(null);
  const draft = ref<SpecDraft>({});
  const baseDraft = ref<SpecDraft>({});
  const { loading, error: loadError, track } = useLoadState();
  const saving = ref(false);
  const conflict = ref<SaveConflict | null>(null);

  const check = computed(() => checkDraft(draft.value));
  // The stored spec's text is made once per load, not again on every keystroke.
  const baseJson = computed(() => JSON.stringify(draftToSpec(baseDraft.value)));
  const dirty = computed(() => JSON.stringify(draftToSpec(draft.value)) !== baseJson.value);

  function adopt(record: Design): void {
    design.value = record;
    draft.value = specToDraft(record.spec);
    baseDraft.value = { ...draft.value };
  }

  async function load(id: number): Promise<void> {
    conflict.value = null;
    await track(async () => {
      adopt(await designsApi.get(id));
    });
  }

  function setField(path: string, value: string): void {
    // A new filter kind or "set by" brings up fields filled from the design on screen (filterSwitch.ts).
    const filled = filterSwitchEdits(check.value.spec, draft.value, path, value);
    // In place: only what reads these fields updates (the field typed in, the check, the analysis),
    // not every field of the form (SpecField).
    Object.assign(draft.value, { [path]: value, ...filled });
  }

  /** Save the draft; on a stale revision keep the draft and describe the clash instead. */
  async function save(baseRevision = design.value?.revision): Promise<'saved' | 'conflict' | 'invalid'> {
    const current = design.value;
    const spec = check.value.spec;
    if (!current || baseRevision === undefined) return 'invalid';
    if (!spec) return 'invalid';
    saving.value = true;
    try {
      const saved = await designsApi.save(current.id, { baseRevision, spec });
      adopt(saved);
      conflict.value = null;
      return 'saved';
    } catch (cause) {
      const theirs = conflictingDesign(cause);
      if (!theirs) throw cause;
      conflict.value = { theirs, changes: threeWay(draftToSpec(baseDraft.value), draftToSpec(draft.value), theirs.spec) };
      return 'conflict';
    } finally {
      saving.value = false;
    }
  }

  /**
   * Put my edits on top of their revision: fields only they changed keep their value, fields I
   * changed take mine (on a clash, mine wins — the dialog showed both), then save against theirs.
   */
  async function keepMine(): Promise<'saved' | 'conflict' | 'invalid'> {
    const theirs = conflict.value?.theirs;
    if (!theirs) return 'invalid';
    const merged: SpecDraft = specToDraft(theirs.spec);
    for (const [path, value] of Object.entries(draft.value)) {
      if (value !== baseDraft.value[path]) merged[path] = value;
    }
    draft.value = merged;
    baseDraft.value = specToDraft(theirs.spec);
    design.value = theirs;
    return save(theirs.revision);
  }

  /** Drop my edits and continue from their revision. */
  function takeTheirs(): void {
    const theirs = conflict.value?.theirs;
    if (!theirs) return;
    adopt(theirs);
    conflict.value = null;
  }

  return { design, draft, loading, saving, loadError, conflict, check, dirty, load, setField, save, keepMine, takeTheirs };
});

/** The current record a 409 stale_revision carries in error.current (packages/api contract). */
function conflictingDesign(cause: unknown): Design | null {
  if (!(cause instanceof ApiError) || cause.status !== 409) return null;
  const body = cause.body as { error?: { current?: unknown } } | undefined;
  const current = body?.error?.current as { design?: Design } | Design | undefined;
  if (!current) return null;
  if ('design' in current && current.design) return current.design;
  return 'spec' in current ? (current as Design) : null;
}
