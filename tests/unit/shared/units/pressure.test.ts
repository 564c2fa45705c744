import { describe, expect, it } from 'vitest';
import { METRES_PER_FOOT } from '@shared/units/length';
import {
  PASCALS_PER_PSI,
  PRESSURE_UNITS,
  WATER_DENSITY_20C,
  pressureFromSi,
  pressureToSi,
  waterHeadM,
} from '@shared/units/pressure';

const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);

describe('pressure units', () => {
  it('converts psi with the NIST SP 811 factor', () => {
    // NIST SP 811: 1 psi = 6894.757 Pa ±1e−7 relative (the exact value is 6894.757293… Pa)
    expect(rel(pressureToSi(1, 'psi'), 6894.757)).toBeLessThan(1e-7);
    expect(PASCALS_PER_PSI).toBeCloseTo(6894.757293168, 6);
  });

  it('gives the metres of water in one psi at 1000 kg/m³ and at 20 °C', () => {
    // domain notes (derived): 1 psi of water = 0.70307 m at ρ = 1000 kg/m³ ±1e−5 m
    expect(waterHeadM(pressureToSi(1, 'psi'), 1000)).toBeCloseTo(0.70307, 5);
    // domain notes (derived): 0.70433 m at 20 °C (ρ = 998.2071 kg/m³) ±1e−5 m
    expect(waterHeadM(pressureToSi(1, 'psi'), WATER_DENSITY_20C)).toBeCloseTo(0.70433, 5);
  });

  it('agrees with the rule of thumb of 2.31 ft of water per psi', () => {
    // common practice: 2.31 ft per psi, ±0.005 ft
    expect(waterHeadM(pressureToSi(1, 'psi'), 1000) / METRES_PER_FOOT).toBeCloseTo(2.31, 2);
  });

  it('converts mbar, hPa and kPa', () => {
    expect(pressureToSi(1013.25, 'mbar')).toBeCloseTo(101325, 9);
    expect(pressureToSi(1013.25, 'hPa')).toBeCloseTo(101325, 9);
    expect(pressureToSi(101.325, 'kPa')).toBeCloseTo(101325, 9);
  });

  it('converts a water column with the stated density', () => {
    // ρ g h with g = 9.80665 m/s² (NIST SP 811, standard gravity)
    expect(pressureToSi(1, 'mH2O', 1000)).toBeCloseTo(9806.65, 9);
    expect(pressureToSi(1, 'ftH2O', 1000)).toBeCloseTo(9806.65 * 0.3048, 9);
    expect(pressureFromSi(pressureToSi(3, 'ftH2O', 998.2), 'ftH2O', 998.2)).toBeCloseTo(3, 12);
  });

  it('asks for the density of water before converting a water column', () => {
    expect(() => pressureToSi(1, 'mH2O')).toThrow('waterDensityKgM3: is required to convert mH2O');
    expect(() => pressureToSi(1, 'ftH2O', 0)).toThrow('waterDensityKgM3: must be greater than 0 (got 0)');
  });

  it('lists every unit with a readable label', () => {
    expect(PRESSURE_UNITS.map((u) => u.id)).toEqual(['Pa', 'kPa', 'psi', 'mbar', 'hPa', 'mH2O', 'ftH2O']);
    expect(PRESSURE_UNITS.find((u) => u.id === 'ftH2O')?.label).toBe('ft of water');
  });
});
