import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { nextTick, reactive } from 'vue';
import { mainsSyncSpec } from '@loopwright/dsp';
import SpecForm from '../src/components/SpecForm.vue';
import SpecField from '../src/components/SpecField.vue';
import { specToDraft } from '../src/form/specDraft.ts';
import { checkDraft } from '../src/form/specValidation.ts';

/**
 * A keystroke must not re-render the whole form while the user waits for the plot (issue 16). The
 * design store edits its draft in place, as here; a component that re-rendered has a new subTree
 * vnode, one that Vue skipped keeps its old one.
 */
function mountForm(draft: Record<string, string>, errors: Readonly<Record<string, string>>) {
  const wrapper = mount(SpecForm, { props: { draft, errors } });
  const fields = () => wrapper.findAllComponents(SpecField);
  const snapshot = () => new Map(fields().map((f) => [f.props('field').path, f.vm.$.subTree]));
  const rerendered = (before: Map<string, unknown>) => fields().filter((f) => f.vm.$.subTree !== before.get(f.props('field').path)).map((f) => f.props('field').path);
  return { wrapper, fields, snapshot, rerendered };
}

describe('spec form updates', () => {
  it('does not re-render the form or any other field when one field is typed in, and shows the new text', async () => {
    const draft = reactive(specToDraft(mainsSyncSpec));
    const { wrapper, snapshot, rerendered } = mountForm(draft, checkDraft(draft).errors);
    const before = snapshot();
    const formTree = wrapper.vm.$.subTree;
    expect(before.size).toBeGreaterThan(15);

    draft['filter.damping'] = '0.55';
    // A valid draft checks to the same (empty) errors object, so the form's props do not change.
    expect(checkDraft(draft).errors).toBe(wrapper.props('errors'));
    await nextTick();

    expect(wrapper.vm.$.subTree).toBe(formTree);
    // The damping field reads its text inside its form item's slot: the form item updates, the
    // field component itself need not.
    expect(rerendered(before)).toEqual([]);
    expect((wrapper.find('input[data-test="filter-damping"]').element as HTMLInputElement).value).toBe('0.55');
  });

  it('gives new props only to the field that gets a message', async () => {
    const draft = reactive(specToDraft(mainsSyncSpec));
    const { wrapper, fields, snapshot, rerendered } = mountForm(draft, {});
    const before = snapshot();

    draft['centerHz'] = 'x';
    await wrapper.setProps({ errors: { centerHz: 'Centre frequency must be a number.' } });

    expect(rerendered(before)).toEqual(['centerHz']);
    expect(fields().find((f) => f.props('field').path === 'centerHz')!.props('error')).toBe('Centre frequency must be a number.');
  });

  it('shows the fields a switch brings in when the draft changes in place', async () => {
    const draft = reactive(specToDraft(mainsSyncSpec));
    const { wrapper } = mountForm(draft, {});
    expect(wrapper.find('input[data-test="filter-tau1-s"]').exists()).toBe(false);
    draft['filter.mode'] = 'time-constants';
    await nextTick();
    expect(wrapper.find('input[data-test="filter-tau1-s"]').exists()).toBe(true);
    expect(wrapper.find('input[data-test="filter-damping"]').exists()).toBe(false);
  });
});
