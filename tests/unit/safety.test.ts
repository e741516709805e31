import { describe, expect, it } from 'vitest';
import { safetyCautions } from '@shared/safety';

const none = { carriesLoad: false, overhead: false, vehicle: false, heat: false };

describe('safety cautions · what a flagged part shows', () => {
  it('safety cautions · a part with no flag · nothing shown', () => {
    expect(safetyCautions(none)).toEqual([]);
  });

  it('safety cautions · a load-bearing part · asks for a safety cable, names the tested load, defers to the rigging lead (common practice)', () => {
    const texts = safetyCautions({ ...none, carriesLoad: true }, 0.8)
      .map((c) => c.text)
      .join(' ');
    expect(texts).toMatch(/tested load of 0.8 kg/);
    expect(texts).toMatch(/safety cable/);
    expect(texts).toMatch(/key grip, the rigging lead and local codes/);
  });

  it('safety cautions · a dashboard in sun · says what the recipe materials do (69.4 °C, Vanos et al. 2018)', () => {
    const heat = safetyCautions({ ...none, vehicle: true }, null, ['PLA', 'ASA', 'PLA']).find((c) => c.flag === 'heat')!;
    expect(heat.text).toMatch(/PLA softens at about 55 °C, below the 69 °C/);
    expect(heat.text).toMatch(/ASA softens at about 90 °C, well above/);
    expect(heat.text.match(/PLA softens/g)).toHaveLength(1);
  });

  it('safety cautions · no material known · the general heat figure', () => {
    const heat = safetyCautions({ ...none, heat: true }).find((c) => c.flag === 'heat')!;
    expect(heat.text).toMatch(/about 69 °C/);
  });
});
