import { describe, expect, it } from 'vitest';
import { ChemistryInputError, chlorideNitriteRatio, freeCo2MgL, saltToRaiseChlorideKg } from './index';

describe('chlorideNitriteRatio (SRAC 462)', () => {
  it('passes 10 : 1 and fails below, saying how much chloride to add', () => {
    // Durborow, Crosby & Brunson 1997, SRAC 462 minimum 10 : 1 (published)
    expect(chlorideNitriteRatio({ chlorideMgL: 50, nitriteMgL: 5, nitriteBasis: 'no2-n' })).toMatchObject({
      ratio: 10,
      ok: true,
      chlorideToAddMgL: 0,
    });
    const low = chlorideNitriteRatio({ chlorideMgL: 30, nitriteMgL: 5, nitriteBasis: 'no2' });
    expect(low).toMatchObject({
      ratio: 6,
      ok: false,
      chlorideNeededMgL: 50,
      chlorideToAddMgL: 20,
      nitriteBasis: 'no2',
    });
  });

  it('reports no ratio when there is no nitrite', () => {
    expect(chlorideNitriteRatio({ chlorideMgL: 20, nitriteMgL: 0, nitriteBasis: 'no2-n' })).toMatchObject({
      ratio: null,
      ok: true,
    });
  });
});

describe('saltToRaiseChlorideKg', () => {
  it('needs 1.6485 g NaCl per m³ per mg/L chloride, 4.48 lb per acre-foot', () => {
    // NaCl/Cl molar-mass ratio, husbandry.md §3 (computed); 1 acre-ft = 1233.48 m³
    expect(saltToRaiseChlorideKg({ volumeM3: 1, chlorideRiseMgL: 1 }) * 1000).toBeCloseTo(1.6485, 4);
    expect(saltToRaiseChlorideKg({ volumeM3: 1233.48, chlorideRiseMgL: 1 }) / 0.45359237).toBeCloseTo(4.48, 2);
  });
});

describe('freeCo2MgL (APHA 4500-CO2 approximation)', () => {
  it('gives 20 mg/L for alkalinity 100 mg/L CaCO3 at pH 7', () => {
    // 2.0 × alkalinity × 10^(6 − pH), APHA 4500-CO2 (from memory); value (computed)
    expect(freeCo2MgL({ alkalinityMgLCaCO3: 100, pH: 7 })).toBeCloseTo(20, 10);
  });

  it('refuses pH above 8.5 where carbonate makes the approximation wrong', () => {
    expect(() => freeCo2MgL({ alkalinityMgLCaCO3: 100, pH: 9 })).toThrow(ChemistryInputError);
  });
});
