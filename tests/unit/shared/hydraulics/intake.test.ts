import { describe, expect, it } from 'vitest';
import { bouwerRiceK } from '../../../../shared/hydraulics/bouwer-rice';
import { hvorslevK } from '../../../../shared/hydraulics/hvorslev';
import { intakeScreenInFilterPackFlag } from '../../../../shared/hydraulics/qc';
import { defaultIntakeRadius } from '../../../../shared/schemas/wells';

// Check value 7 (docs/methods.md, derived from Bouwer & Rice 1976): rc = 0.0254, rw = 0.1016, Le = 3.048, Lw = 6, D = 20 m, T0 = 60 s.
const br = { casingRadiusM: 0.0254, screenRadiusM: 0.0254, boreholeRadiusM: 0.1016, screenLengthM: 3.048, staticToScreenBottomM: 6, saturatedThicknessM: 20 };

describe('the intake radius', () => {
  it('is Bouwer-Rice’s rw: the borehole by default and when chosen (check value 7: 4.243e-6 m/s), the screen when chosen', () => {
    expect(bouwerRiceK(br, 60).kMetersPerSecond).toBeCloseTo(4.243e-6, 9);
    expect(bouwerRiceK({ ...br, intake: 'borehole' }, 60).kMetersPerSecond).toBeCloseTo(4.243e-6, 9);
    const onScreen = bouwerRiceK({ ...br, intake: 'screen' }, 60);
    expect(onScreen.boreholeRadiusM).toBe(0.0254);
    expect(onScreen.kMetersPerSecond).not.toBeCloseTo(4.243e-6, 9);
  });

  it('is Hvorslev’s R: the screen by default, the borehole when chosen', () => {
    const g = { casingRadiusM: 0.0254, screenRadiusM: 0.0254, boreholeRadiusM: 0.1016, screenLengthM: 3.048 };
    expect(hvorslevK(g, 60).intakeRadiusM).toBe(0.0254);
    expect(hvorslevK({ ...g, intake: 'borehole' }, 60).intakeRadiusM).toBe(0.1016);
  });

  it('defaults a new well to the borehole only where the borehole is wider than the screen', () => {
    expect(defaultIntakeRadius(0.0254, 0.1016)).toBe('borehole');
    expect(defaultIntakeRadius(0.0254, 0.0254)).toBe('screen');
  });
});

describe('the screen radius in a filter pack', () => {
  it('is a warning naming both radii and the K each gives', () => {
    const f = intakeScreenInFilterPackFlag({ method: 'hvorslev', screenRadiusM: 0.0254, boreholeRadiusM: 0.1016, kScreenMetersPerSecond: 2.82e-5, kBoreholeMetersPerSecond: 2e-5 });
    expect(f).toMatchObject({ code: 'intake-screen-in-filter-pack', severity: 'warning', values: { screenRadiusM: 0.0254, boreholeRadiusM: 0.1016, kScreenMetersPerSecond: 2.82e-5, kBoreholeMetersPerSecond: 2e-5 } });
    expect(f!.message).toContain('0.0254 m');
    expect(f!.message).toContain('0.1016 m');
    expect(f!.message).toContain('2.82e-5 m/s with the screen radius');
    expect(f!.message).toContain('2.00e-5 m/s with the borehole radius');
  });

  it('is not raised where the borehole is no wider than the screen', () => {
    expect(intakeScreenInFilterPackFlag({ method: 'hvorslev', screenRadiusM: 0.05, boreholeRadiusM: 0.05, kScreenMetersPerSecond: 1e-5, kBoreholeMetersPerSecond: 1e-5 })).toBeNull();
  });
});
