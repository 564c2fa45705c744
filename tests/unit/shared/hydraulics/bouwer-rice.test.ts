import { describe, expect, it } from 'vitest';
import { LE_OVER_RW_MAX, bouwerRiceK, vanRooyCoefficients } from '@shared/hydraulics/bouwer-rice';
import { EngineInputError } from '@shared/hydraulics/errors';

describe('Van Rooy polynomials for the Bouwer-Rice coefficients', () => {
  // derived from the polynomials of Van Rooy (1988) as given by Butler (1998), ±5e−5 (printed to 4 decimals)
  it.each([
    [10, 1.8177, 0.2884, 1.1856],
    [100, 4.2907, 0.7252, 4.2483],
    [1000, 9.052, 2.8309, 12.213],
  ])('gives A, B, C at Le/rw = %d', (x, a, b, c) => {
    const coefficients = vanRooyCoefficients(x);
    expect(Math.abs(coefficients.a - a)).toBeLessThan(5e-5);
    expect(Math.abs(coefficients.b - b)).toBeLessThan(5e-5);
    expect(Math.abs(coefficients.c - c)).toBeLessThan(5e-5);
    expect(coefficients.reference).toContain('Van Rooy (1988)');
  });
});

describe('Bouwer-Rice K', () => {
  const base = { casingRadiusM: 0.0254, screenRadiusM: 0.1016, screenLengthM: 3.048, staticToScreenBottomM: 6.0 };

  it('gives ln(Re/rw) and K for a partially penetrating well', () => {
    const k = bouwerRiceK({ ...base, saturatedThicknessM: 20 }, 60);
    // derived from Bouwer & Rice (1976) with Van Rooy (1988): ln(Re/rw) = 2.4055 ±5e−5, K = 4.243e−6 m/s ±5e−10
    expect(Math.abs(k.lnReOverRw - 2.4055)).toBeLessThan(5e-5);
    expect(Math.abs(k.kMetersPerSecond - 4.243e-6)).toBeLessThan(5e-10);
    expect(k.penetration).toBe('partial');
    expect(k.capApplied).toBe(false);
  });

  it('gives ln(Re/rw) and K for a fully penetrating well (D = Lw)', () => {
    const k = bouwerRiceK({ ...base, saturatedThicknessM: 6.0 }, 60);
    // derived from Bouwer & Rice (1976): ln(Re/rw) = 2.9909 ±5e−5, K = 5.276e−6 m/s ±5e−10
    expect(Math.abs(k.lnReOverRw - 2.9909)).toBeLessThan(5e-5);
    expect(Math.abs(k.kMetersPerSecond - 5.276e-6)).toBeLessThan(5e-10);
    expect(k.penetration).toBe('full');
  });

  it('caps ln((D − Lw)/rw) at 6 in a thick aquifer', () => {
    const k = bouwerRiceK({ ...base, saturatedThicknessM: 1000 }, 60);
    // derived from Bouwer & Rice (1976), cap at 6: ln(Re/rw) = 2.3275 ±5e−5, K = 4.105e−6 m/s ±5e−10
    expect(Math.abs(k.lnReOverRw - 2.3275)).toBeLessThan(5e-5);
    expect(Math.abs(k.kMetersPerSecond - 4.105e-6)).toBeLessThan(5e-10);
    expect(k.capApplied).toBe(true);
    expect(k.lnBelowScreen).toBeGreaterThan(6);
  });

  it('uses the effective casing radius when the level moves within the filter pack', () => {
    const nominal = bouwerRiceK({ ...base, saturatedThicknessM: 20 }, 60);
    const inPack = bouwerRiceK({ ...base, saturatedThicknessM: 20, boreholeRadiusM: 0.1016, filterPackPorosity: 0.3 }, 60);
    expect(inPack.casingRadiusIsEffective).toBe(true);
    // derived: K scales with rc², here (0.05957 / 0.0254)² ±1e−3 relative
    expect(inPack.kMetersPerSecond / nominal.kMetersPerSecond).toBeCloseTo((0.059568 / 0.0254) ** 2, 2);
  });

  it('refuses Le/rw beyond the range where the polynomials hold, saying so', () => {
    const long = { casingRadiusM: 0.0254, screenRadiusM: 0.001, screenLengthM: 3.048, staticToScreenBottomM: 6, saturatedThicknessM: 20 };
    expect(() => bouwerRiceK(long, 60)).toThrow(EngineInputError);
    expect(() => bouwerRiceK(long, 60)).toThrow(
      'geometry.screenLengthM: screen length over borehole radius Le/rw = 3048 is outside 1–1500, the range where the Bouwer-Rice coefficient polynomials hold',
    );
    expect(() => vanRooyCoefficients(LE_OVER_RW_MAX + 1)).toThrow('is outside 1–1500');
    expect(() => vanRooyCoefficients(0.5)).toThrow('Le/rw = 0.5000 is outside 1–1500');
  });

  it('asks for the static-to-screen-bottom length and the saturated thickness', () => {
    expect(() => bouwerRiceK({ casingRadiusM: 0.0254, screenRadiusM: 0.1, screenLengthM: 3 }, 60)).toThrow(
      'geometry.staticToScreenBottomM: is required for Bouwer-Rice',
    );
    expect(() => bouwerRiceK({ casingRadiusM: 0.0254, screenRadiusM: 0.1, screenLengthM: 3, staticToScreenBottomM: 5 }, 60)).toThrow(
      'geometry.saturatedThicknessM: is required for Bouwer-Rice',
    );
  });

  it('refuses a screen longer than Lw and an aquifer thinner than Lw', () => {
    expect(() => bouwerRiceK({ ...base, screenLengthM: 7, saturatedThicknessM: 20 }, 60)).toThrow(
      'geometry.screenLengthM: 7 m is longer than Lw = 6 m',
    );
    expect(() => bouwerRiceK({ ...base, saturatedThicknessM: 5 }, 60)).toThrow('geometry.saturatedThicknessM: 5 m is less than Lw = 6 m');
  });

  it('carries its reference', () => {
    expect(bouwerRiceK({ ...base, saturatedThicknessM: 20 }, 60).reference).toContain('Bouwer & Rice (1976)');
  });
});
