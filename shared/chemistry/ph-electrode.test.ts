import { describe, expect, it } from 'vitest';
import { nernstSlopeMvPerPh, phElectrodeSlope } from './index';

describe('phElectrodeSlope', () => {
  it('gives 97.8 % of Nernst for −5.0 mV at pH 7.00 and +168.0 mV at pH 4.01, and passes', () => {
    // two-buffer slope check, husbandry.md §5 (computed)
    const result = phElectrodeSlope({ mV1: -5.0, pH1: 7.0, mV2: 168.0, pH2: 4.01 });
    expect(result.slopePct).toBeCloseTo(97.8, 1);
    expect(result.offsetMv).toBeCloseTo(-5.0, 10);
    expect(result.ok).toBe(true);
  });

  it('uses a Nernst slope of 59.16 mV/pH at 25 °C', () => {
    // Nernst slope at 25 °C (published practice)
    expect(nernstSlopeMvPerPh({ temperatureC: 25 })).toBeCloseTo(59.16, 2);
  });

  it('fails a tired electrode below 95 % or one offset beyond ±30 mV', () => {
    // acceptance band 95–105 %, ±30 mV (published practice)
    expect(phElectrodeSlope({ mV1: 0, pH1: 7, mV2: 160, pH2: 4 }).ok).toBe(false);
    expect(phElectrodeSlope({ mV1: 40, pH1: 7, mV2: 217, pH2: 4 }).ok).toBe(false);
  });

  it('rejects two buffers at the same pH', () => {
    expect(() => phElectrodeSlope({ mV1: 0, pH1: 7, mV2: 1, pH2: 7 })).toThrow(RangeError);
  });
});
