import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../../shared/hydraulics/errors';
import { pressureToWaterHeadM } from '../../../../shared/units/pressure';
import { parseElapsedText } from '../../../../shared/units/time';
import { clockTimeToEpochSeconds } from '../../../../shared/units/timestamp';

describe('a static level typed as a pressure', () => {
  it('is the water column above the sensor: 1 psi is 0.70307 m at 1000 kg/m³ and 0.70433 m at 20 °C (docs/methods.md §1, derived)', () => {
    expect(pressureToWaterHeadM(1, 'psi', 1000)).toBeCloseTo(0.70307, 5);
    expect(pressureToWaterHeadM(1, 'psi', 998.2071)).toBeCloseTo(0.70433, 5);
  });

  it('is the same head in a water-column unit at any density: 3 mH2O is 3 m', () => {
    expect(pressureToWaterHeadM(3, 'mH2O', 1000)).toBeCloseTo(3, 12);
    expect(pressureToWaterHeadM(3, 'mH2O', 1025)).toBeCloseTo(3, 12);
  });
});

describe('an elapsed time as text', () => {
  it.each([
    ['1:30', 's', 90],
    ['1:02:03', 's', 3723],
    ['90 s', 'min', 90],
    ['90s', 'min', 90],
    ['1.5 min', 's', 90],
    ['1,5 min', 's', 90],
    ['2 h', 's', 7200],
    ['90', 's', 90],
    ['1.5', 'min', 90],
  ] as const)('reads %s (bare numbers in %s) as %d s', (text, unit, seconds) => {
    expect(parseElapsedText(text, unit)).toBeCloseTo(seconds, 9);
  });

  it('refuses what is not a time, naming the field', () => {
    expect(() => parseElapsedText('soon', 's', 'testStart')).toThrow(EngineInputError);
    expect(() => parseElapsedText('90 parsecs', 's', 'testStart')).toThrow(/not an elapsed time/);
    expect(() => parseElapsedText('1:75', 's', 'testStart')).toThrow(/below 60/);
  });
});

describe('a time of day for a timestamped record', () => {
  // 2024-07-01 09:00:00 CDT (UTC−5) = 14:00:00Z
  const first = Date.UTC(2024, 6, 1, 14, 0, 0) / 1000;

  it('is on the first reading’s day in the record’s zone', () => {
    expect(clockTimeToEpochSeconds('09:00:15', 'America/Chicago', first)).toBe(first + 15);
    expect(clockTimeToEpochSeconds('9:00:15 AM', 'America/Chicago', first)).toBe(first + 15);
    expect(clockTimeToEpochSeconds('2:30 PM', 'America/Chicago', first)).toBe(first + 5.5 * 3600);
    expect(clockTimeToEpochSeconds('14:00:15', 'UTC', first)).toBe(first + 15);
  });

  it('is the next day when the record runs past midnight', () => {
    const lateFirst = Date.UTC(2024, 6, 2, 4, 50, 0) / 1000; // 23:50 CDT on 1 July
    expect(clockTimeToEpochSeconds('00:10', 'America/Chicago', lateFirst)).toBe(lateFirst + 20 * 60);
  });

  it('reads a full ISO date and time as it stands, in the zone', () => {
    expect(clockTimeToEpochSeconds('2024-07-01 09:00:15', 'America/Chicago', first)).toBe(first + 15);
  });

  it('refuses what is not a time of day, naming the field', () => {
    expect(() => clockTimeToEpochSeconds('25:00', 'UTC', first, 'settings.testStartText')).toThrow(/not a valid time of day/);
    expect(() => clockTimeToEpochSeconds('noon-ish', 'UTC', first, 'settings.testStartText')).toThrow(/not a time of day/);
  });
});
