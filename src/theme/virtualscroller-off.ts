// Stands in for PrimeVue's VirtualScroller, which Select and MultiSelect import whether or not
// virtual scrolling is on (8 kB gzip on every page with a dropdown). Rigshelf never sets
// virtualScrollerOptions, so the scroller is always disabled, and disabled it only renders its slots:
// this does the same (vite.config.ts points `primevue/virtualscroller` here). To turn virtual
// scrolling on anywhere, remove that alias first.
import { defineComponent, Fragment, h, type PropType } from 'vue';

export default defineComponent({
  name: 'VirtualScroller',
  inheritAttrs: false,
  props: {
    items: { type: Array as PropType<unknown[] | null>, default: null },
    columns: { type: Array as PropType<unknown[] | null>, default: null },
  },
  setup(props, { slots, expose }) {
    expose({ scrollToIndex: () => undefined, scrollTo: () => undefined, scrollInView: () => undefined });
    return () => h(Fragment, [slots.default?.(), slots.content?.({ items: props.items, rows: props.items, columns: props.columns })]);
  },
});
