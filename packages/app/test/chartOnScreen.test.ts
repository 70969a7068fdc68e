/**
 * A chart off screen (scrolled away, or in a tab not shown) holds its last drawing and draws the
 * newest option when it comes on screen (IntersectionObserver as the browser reports it; here a
 * stand-in the test drives). Expected values are the options the test itself passed in.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h, nextTick } from 'vue';
import { mount } from '@vue/test-utils';
import LwChart from '../src/components/LwChart.vue';

type Callback = (entries: { isIntersecting: boolean }[]) => void;
const observers: { callback: Callback; disconnected: boolean }[] = [];

class FakeObserver {
  private readonly entry: { callback: Callback; disconnected: boolean };
  constructor(callback: Callback) {
    this.entry = { callback, disconnected: false };
    observers.push(this.entry);
  }
  observe(): void {}
  disconnect(): void {
    this.entry.disconnected = true;
  }
}

/** Stands in for vue-echarts: shows which option it was given. */
vi.mock('vue-echarts', () => ({
  default: defineComponent({
    name: 'Echarts',
    props: { option: { type: Object, default: null } },
    setup: (props) => () => h('div', { 'data-title': (props.option as { title?: string } | null)?.title ?? '' }),
  }),
}));

function drawnTitle(wrapper: ReturnType<typeof mount>): string | undefined {
  return wrapper.find('[data-title]').attributes('data-title');
}

describe('a chart off screen', () => {
  beforeEach(() => {
    observers.length = 0;
    vi.stubGlobal('IntersectionObserver', FakeObserver);
  });
  afterEach(() => vi.unstubAllGlobals());

  it('keeps its last drawing while hidden and draws the newest option when it is shown', async () => {
    const wrapper = mount(LwChart, { props: { option: { title: 'first' }, height: '100px', testId: 'c' } });
    expect(drawnTitle(wrapper)).toBe('first');
    observers[0]!.callback([{ isIntersecting: false }]);
    await wrapper.setProps({ option: { title: 'second' } });
    await wrapper.setProps({ option: { title: 'third' } });
    expect(drawnTitle(wrapper)).toBe('first');
    expect(wrapper.find('[data-test="c"]').attributes('data-drawn')).toBe('held');
    observers[0]!.callback([{ isIntersecting: true }]);
    await nextTick();
    expect(drawnTitle(wrapper)).toBe('third');
    expect(wrapper.find('[data-test="c"]').attributes('data-drawn')).toBe('current');
    await wrapper.setProps({ option: { title: 'fourth' } });
    expect(drawnTitle(wrapper)).toBe('fourth');
    wrapper.unmount();
    expect(observers[0]!.disconnected).toBe(true);
  });

  it('draws every option where the browser has no IntersectionObserver', async () => {
    vi.stubGlobal('IntersectionObserver', undefined);
    const wrapper = mount(LwChart, { props: { option: { title: 'first' }, height: '100px', testId: 'c' } });
    await wrapper.setProps({ option: { title: 'second' } });
    expect(drawnTitle(wrapper)).toBe('second');
  });

  it('builds an option given as a function only when it draws it, and only once per function', async () => {
    const built: string[] = [];
    const builder = (title: string) => () => {
      built.push(title);
      return { title };
    };
    const wrapper = mount(LwChart, { props: { option: builder('first'), height: '100px', testId: 'c' } });
    expect(drawnTitle(wrapper)).toBe('first');
    observers[0]!.callback([{ isIntersecting: false }]);
    await wrapper.setProps({ option: builder('second') });
    await wrapper.setProps({ option: builder('third') });
    expect(built).toEqual(['first']);
    expect(wrapper.find('[data-test="c"]').attributes('data-drawn')).toBe('held');
    observers[0]!.callback([{ isIntersecting: true }]);
    await nextTick();
    expect(drawnTitle(wrapper)).toBe('third');
    expect(built).toEqual(['first', 'third']);
    observers[0]!.callback([{ isIntersecting: false }]);
    observers[0]!.callback([{ isIntersecting: true }]);
    await nextTick();
    expect(built).toEqual(['first', 'third']);
  });
});
