import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { mainsSyncSpec } from '@loopwright/dsp';
import SpecForm from '../src/components/SpecForm.vue';
import SpecField from '../src/components/SpecField.vue';
import { specToDraft } from '../src/form/specDraft.ts';

/**
 * A keystroke must not re-render the whole form while the user waits for the plot (issue 16): a
 * component that re-rendered has a new subTree vnode, one that Vue skipped keeps its old one.
 */
describe('spec form updates', () => {
  it('re-renders only the field whose text changed, and shows the new text there', async () => {
    const draft = specToDraft(mainsSyncSpec);
    const wrapper = mount(SpecForm, { props: { draft, errors: {} } });
    const fields = () => wrapper.findAllComponents(SpecField);
    const before = new Map(fields().map((f) => [f.props('field').path, f.vm.$.subTree]));
    expect(before.size).toBeGreaterThan(15);

    await wrapper.setProps({ draft: { ...draft, 'filter.damping': '0.55' } });

    const rerendered = fields().filter((f) => f.vm.$.subTree !== before.get(f.props('field').path)).map((f) => f.props('field').path);
    expect(rerendered).toEqual(['filter.damping']);
    expect((wrapper.find('input[data-test="filter-damping"]').element as HTMLInputElement).value).toBe('0.55');
  });

  it('re-renders the field that gets a message, and only it', async () => {
    const draft = specToDraft(mainsSyncSpec);
    const wrapper = mount(SpecForm, { props: { draft, errors: {} } });
    const fields = () => wrapper.findAllComponents(SpecField);
    const before = new Map(fields().map((f) => [f.props('field').path, f.vm.$.subTree]));

    await wrapper.setProps({ draft: { ...draft, centerHz: 'x' }, errors: { centerHz: 'Centre frequency must be a number.' } });

    const rerendered = fields().filter((f) => f.vm.$.subTree !== before.get(f.props('field').path)).map((f) => f.props('field').path);
    expect(rerendered).toEqual(['centerHz']);
  });
});
