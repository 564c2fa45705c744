import { describe, expect, it } from 'vitest';
import { hvorslevK, hvorslevT0Seconds } from '@shared/hydraulics/hvorslev';
import { lengthToSi } from '@shared/units/length';
import { kFromSi } from '@shared/units/conductivity';
import { timeToSi } from '@shared/units/time';

const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);
const cm = (x: number) => lengthToSi(x, 'cm');

describe('Hvorslev K, case G (well point in uniform soil)', () => {
  it('reproduces example 5 of Hvorslev’s Fig. 13', () => {
    const k = hvorslevK({ casingRadiusM: cm(0.475), screenRadiusM: cm(1.905), screenLengthM: cm(45.72) }, 78.5);
    // Hvorslev 1951, Fig. 13 ex. 5: K = 1.00e−6 m/s ±1 %
    expect(rel(k.kMetersPerSecond, 1.0e-6)).toBeLessThan(0.01);
    // Hvorslev 1951, Fig. 13 ex. 5 prints k = 1e−4 cm/s for T = 1.3 min; ±2 % for the rounded 1.3 min
    const kFromPrintedLag = hvorslevK({ casingRadiusM: cm(0.475), screenRadiusM: cm(1.905), screenLengthM: cm(45.72) }, timeToSi(1.3, 'min'));
    expect(rel(kFromSi(kFromPrintedLag.kMetersPerSecond, 'cm/s'), 1e-4)).toBeLessThan(0.02);
  });

  it('reproduces the basic time lag of example 4 of Hvorslev’s Fig. 13', () => {
    const geometry = { casingRadiusM: cm(2.54), screenRadiusM: cm(2.54), screenLengthM: cm(60.96) };
    const t0 = hvorslevT0Seconds(geometry, 1e-5);
    // Hvorslev 1951, Fig. 13 ex. 4: T = 2.8 min for k = 1e−3 cm/s, ±0.05 min (printed to 0.1 min)
    expect(Math.abs(t0 / 60 - 2.8)).toBeLessThan(0.05);
    // derived from Hvorslev 1951, Fig. 18 case G: T0 = 168.3 s ±0.1 s
    expect(Math.abs(t0 - 168.3)).toBeLessThan(0.1);
    expect(rel(hvorslevK(geometry, t0).kMetersPerSecond, 1e-5)).toBeLessThan(1e-12);
  });

  it('reproduces example 3 of Hvorslev’s Fig. 13, where the simplified form is off', () => {
    const geometry = { casingRadiusM: cm(2.54), screenRadiusM: cm(2.54), screenLengthM: cm(15.24) };
    const t0 = hvorslevT0Seconds(geometry, 1e-4);
    // Hvorslev 1951, Fig. 13 ex. 3: T = 39 s for k = 1e−2 cm/s (L/D = 3), ±0.5 s (printed to 1 s)
    expect(Math.abs(t0 - 39)).toBeLessThan(0.55);
    // derived from Hvorslev 1951, Fig. 18 case G: 38.5 s ±0.05 s
    expect(Math.abs(t0 - 38.5)).toBeLessThan(0.05);
    const k = hvorslevK(geometry, t0);
    // derived: at L/D = 3 the simplified form ln(L/R) is about 1.5 % off the full form, ±0.1 %
    expect(Math.abs(Math.abs(k.simplified.differencePercent) - 1.5)).toBeLessThan(0.1);
    expect(k.simplified.valid).toBe(false);
  });

  it('agrees with the simplified form within 1 % where Hvorslev says it holds (mL/D > 4)', () => {
    // Hvorslev 1951, p. 32: error < 1 % for mL/D > 4
    for (const lOverD of [4.01, 6, 20, 100]) {
      const k = hvorslevK({ casingRadiusM: 0.025, screenRadiusM: 0.025, screenLengthM: lOverD * 0.05 }, 100);
      expect(k.simplified.valid).toBe(true);
      expect(Math.abs(k.simplified.differencePercent)).toBeLessThan(1);
    }
  });

  it('applies anisotropy as m = √(Kh/Kv) inside the shape factor', () => {
    const isotropic = hvorslevK({ casingRadiusM: 0.025, screenRadiusM: 0.05, screenLengthM: 1 }, 100);
    const anisotropic = hvorslevK({ casingRadiusM: 0.025, screenRadiusM: 0.05, screenLengthM: 1, anisotropyRatio: 4 }, 100);
    expect(anisotropic.anisotropyFactor).toBe(2);
    expect(anisotropic.mLOverD).toBeCloseTo(2 * isotropic.mLOverD, 12);
    const expected = (0.025 ** 2 * Math.asinh(20)) / (2 * 1 * 100);
    expect(rel(anisotropic.kMetersPerSecond, expected)).toBeLessThan(1e-12);
  });

  it('uses the borehole radius as the intake when the filter pack is the intake', () => {
    const k = hvorslevK({ casingRadiusM: 0.025, screenRadiusM: 0.025, boreholeRadiusM: 0.1, screenLengthM: 2, intake: 'borehole' }, 100);
    expect(k.intakeRadiusM).toBe(0.1);
    expect(k.mLOverD).toBeCloseTo(10, 12);
  });

  it('carries the reference of the full form and of the simplified one', () => {
    const k = hvorslevK({ casingRadiusM: 0.025, screenRadiusM: 0.025, screenLengthM: 2 }, 100);
    expect(k.reference).toContain('Hvorslev (1951), Fig. 18 case G, p. 44');
    expect(k.simplified.reference).toContain('Hvorslev (1951), p. 32');
  });
});
