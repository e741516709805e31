import { describe, expect, it } from 'vitest';
import { safetyCautions } from '@shared/safety';

const none = { carriesLoad: false, overhead: false, vehicle: false, heat: false };

describe('safety cautions · what a flagged part shows', () => {
  it('shows nothing for a part with no flag', () => {
    expect(safetyCautions(none)).toEqual([]);
  });

  it('asks for a safety cable and names the tested load of a load-bearing part, deferring to the rigging lead (common practice)', () => {
    const texts = safetyCautions({ ...none, carriesLoad: true }, 0.8).map((c) => c.text).join(' ');
    expect(texts).toMatch(/tested load of 0.8 kg/);
    expect(texts).toMatch(/safety cable/);
    expect(texts).toMatch(/key grip, the rigging lead and local codes/);
  });

  it('says what the recipe materials do on a dashboard in sun (69.4 °C, Vanos et al. 2018)', () => {
    const heat = safetyCautions({ ...none, vehicle: true }, null, ['PLA', 'ASA', 'PLA']).find((c) => c.flag === 'heat')!;
    expect(heat.text).toMatch(/PLA softens at about 55 °C, below the 69 °C/);
    expect(heat.text).toMatch(/ASA softens at about 90 °C, well above/);
    expect(heat.text.match(/PLA softens/g)).toHaveLength(1);
  });

  it('falls back to the general heat figure when no material is known', () => {
    const heat = safetyCautions({ ...none, heat: true }).find((c) => c.flag === 'heat')!;
    expect(heat.text).toMatch(/about 69 °C/);
  });
});
