import { describe, expect, it } from 'vitest';
import { analyzeRecord, type AnalyzeInput } from '@shared/hydraulics/analyze';
import { OscillatingResponseError } from '@shared/hydraulics/errors';
import { MATERIALS } from '@shared/hydraulics/materials';
import { repeatTestFlags } from '@shared/hydraulics/qc';
import { reduceRecord } from '@shared/hydraulics/reduction';
import { gaussian } from '../../../support/gaussian';

const geometry = { casingRadiusM: 0.0254, screenRadiusM: 0.0254, screenLengthM: 3 };

/** Head above a vented sensor, static 0, starting at `h0` and following `shape(t)` (1 at t = 0). */
function input(shape: (t: number) => number, options: { n?: number; dt?: number; h0?: number } = {}): AnalyzeInput {
  const { n = 400, dt = 1, h0 = 0.5 } = options;
  const time = Float64Array.from({ length: n }, (_, i) => i * dt);
  return {
    record: { timeSeconds: time, value: Float64Array.from(time, (t) => -h0 * shape(t)) },
    reduction: { reference: 'vented', staticLevelM: 0 },
    method: 'hvorslev',
    geometry,
  };
}

const codes = (a: { flags: { code: string }[] }) => a.flags.map((f) => f.code);

describe('QC flags', () => {
  const underdamped = (t: number) => Math.exp(-t / 40) * Math.cos((2 * Math.PI * t) / 25);

  it('refuses to fit an oscillating record silently', () => {
    // Butler & Garnett (2000): an oscillating response is outside the overdamped models
    expect(() => analyzeRecord(input(underdamped))).toThrow(OscillatingResponseError);
    expect(() => analyzeRecord(input(underdamped))).toThrow(/^record: The response oscillates: it falls to H\/H0 = -0\.\d+ at t = \d+ s \(changes sign\)/);
  });

  it('fits an oscillating record with the override and keeps the flag', () => {
    const a = analyzeRecord({ ...input(underdamped), allowOscillation: true, window: { kind: 'time', fromSeconds: 0, toSeconds: 5 } });
    const flag = a.flags.find((f) => f.code === 'oscillation');
    expect(flag?.severity).toBe('error');
    expect(flag?.values.lowestNormalizedHead).toBeLessThan(-0.3);
    expect(flag?.suggestion).toContain('underdamped');
  });

  it('diagnoses a level that rises again after recovery without crossing static as a drift, not an oscillation', () => {
    const a = analyzeRecord(input((t) => (t < 100 ? Math.exp(-t / 20) : Math.exp(-5) + 0.2 * (1 - Math.exp(-(t - 100) / 10)))));
    expect(codes(a)).not.toContain('oscillation');
    const drift = a.flags.find((f) => f.code === 'drift-after-recovery');
    expect(drift?.severity).toBe('warning');
    expect(drift?.message).toMatch(/^The level keeps moving after recovery: compensate with a barometric record or fit the early part/);
  });

  it('diagnoses an uncompensated barometric drift past static as a drift, not an oscillation', () => {
    // recovery with T0 = 20 s, then the level keeps falling 2 % of H0 a minute (an absolute sensor without its barometric record)
    const a = analyzeRecord(input((t) => Math.exp(-t / 20) - (0.02 * t) / 60, { n: 1200 }));
    expect(codes(a)).not.toContain('oscillation');
    const drift = a.flags.find((f) => f.code === 'drift-after-recovery');
    expect(drift?.values.lateTrendPerSecond).toBeCloseTo(-0.02 / 60, 4);
    expect(drift?.suggestion).toMatch(/barometric/);
  });

  it('reports oscillation only for a response that crosses static and turns back', () => {
    // crosses static once and comes back toward it: an underdamped response
    const overshoot = (t: number) => Math.exp(-t / 10) * Math.cos((2 * Math.PI * t) / 80);
    expect(() => analyzeRecord(input(overshoot))).toThrow(OscillatingResponseError);
    expect(codes(analyzeRecord({ ...input(overshoot), allowOscillation: true }))).not.toContain('drift-after-recovery');
  });

  it('does not flag a drift on a record that settles at static', () => {
    expect(codes(analyzeRecord(input((t) => Math.exp(-t / 30))))).not.toContain('drift-after-recovery');
  });

  it('does not mistake sensor noise on an overdamped record for oscillation', () => {
    const noise = gaussian(7);
    const a = analyzeRecord(input((t) => Math.exp(-t / 30) + 0.004 * noise(), { n: 3000, dt: 0.1 }));
    expect(codes(a)).not.toContain('oscillation');
  });

  it('flags concave-upward early data and suggests a free line over the later segment', () => {
    // a double straight line: a fast early drain (filter pack) over a slow formation response
    const a = analyzeRecord(input((t) => 0.5 * Math.exp(-t / 3) + 0.5 * Math.exp(-t / 60), { n: 600 }));
    const flag = a.flags.find((f) => f.code === 'concave-upward');
    expect(flag?.severity).toBe('warning');
    expect(flag?.values.slopeRatio).toBeGreaterThan(1.5);
    expect(flag?.suggestion).toBe('Fit a free line over the later segment, e.g. the window H/H0 0.4–0.1.');
    const later = analyzeRecord({ ...input((t) => 0.5 * Math.exp(-t / 3) + 0.5 * Math.exp(-t / 60), { n: 600 }), line: 'free', window: { kind: 'head', upper: 0.4, lower: 0.1 } });
    expect(Math.abs(later.fit.t0Seconds / 60 - 1)).toBeLessThan(0.01);
  });

  it('flags a mild double straight line just past the slope ratio of 1.5', () => {
    const a = analyzeRecord(input((t) => 0.3 * Math.exp(-t / 10) + 0.7 * Math.exp(-t / 40), { n: 600 }));
    expect(a.flags.find((f) => f.code === 'concave-upward')?.values.slopeRatio).toBeCloseTo(1.587, 3);
  });

  it('does not flag a straight semi-log record as concave', () => {
    expect(codes(analyzeRecord(input((t) => Math.exp(-t / 30))))).not.toContain('concave-upward');
  });

  it('flags a window of fewer than 3 readings', () => {
    const a = analyzeRecord({ ...input((t) => Math.exp(-t / 30)), window: { kind: 'time', fromSeconds: 10, toSeconds: 11 } });
    const flag = a.flags.find((f) => f.code === 'too-few-readings');
    expect(flag?.severity).toBe('error');
    expect(flag?.message).toBe('The window holds 2 reading(s); a line needs at least 3 to be checked.');
  });

  it('flags r² below 0.98 and not above it', () => {
    // common practice: r² < 0.98 on the semi-log line; an anchored line over a curved record
    const curved = (t: number) => 0.3 * Math.exp(-t / 10) + 0.7 * Math.exp(-t / 40);
    const low = analyzeRecord({ ...input(curved, { n: 600 }), window: { kind: 'time', fromSeconds: 10, toSeconds: 60 } });
    const flag = low.flags.find((f) => f.code === 'low-r-squared');
    expect(flag?.severity).toBe('warning');
    // the QC reads r² about the mean of ln(H/H0) (0.9632); the figure shown is the anchored line's r² about the origin
    expect(flag?.values.rSquaredAboutMean).toBeCloseTo(0.9632, 4);
    expect(flag?.values.rSquared).toBe(low.fit.rSquared);
    expect(flag?.message).not.toMatch(/-\d/);
    const high = analyzeRecord({ ...input(curved, { n: 600 }), window: { kind: 'time', fromSeconds: 0, toSeconds: 30 } });
    expect(high.fit.rSquared).toBeGreaterThan(0.98);
    expect(codes(high)).not.toContain('low-r-squared');
  });

  it('flags a noisy record’s low r²', () => {
    const noise = gaussian(3);
    const a = analyzeRecord({ ...input((t) => Math.exp(-t / 30) * (1 + 0.25 * noise()), { n: 200 }), window: { kind: 'time', fromSeconds: 0, toSeconds: 20 }, allowOscillation: true });
    expect(a.flags.find((f) => f.code === 'low-r-squared')?.values.rSquared).toBeLessThan(0.98);
  });

  it('flags a window outside the recommended range and not the default one', () => {
    // Butler (1998, memory): 0.15–0.25 for Hvorslev
    const outside = analyzeRecord({ ...input((t) => Math.exp(-t / 30)), window: { kind: 'head', upper: 1, lower: 0.5 } });
    expect(outside.flags.find((f) => f.code === 'window-outside-recommended')?.message).toBe(
      'The window spans H/H0 1–0.513, outside 0.25–0.15 recommended for Hvorslev.',
    );
    expect(codes(analyzeRecord(input((t) => Math.exp(-t / 30))))).not.toContain('window-outside-recommended');
  });

  it('flags a measured H0 far from the slug volume over the casing area', () => {
    // Butler, McElwee & Liu (1996, memory): expected H0 = V / (π rc²)
    const casingArea = Math.PI * 0.0254 ** 2;
    const matching = analyzeRecord({ ...input((t) => Math.exp(-t / 30)), slugVolumeM3: 0.5 * casingArea });
    expect(codes(matching)).not.toContain('h0-mismatch');
    const half = analyzeRecord({ ...input((t) => Math.exp(-t / 30)), slugVolumeM3: 1.0 * casingArea });
    const flag = half.flags.find((f) => f.code === 'h0-mismatch');
    expect(flag?.values.expectedH0M).toBeCloseTo(1, 12);
    expect(flag?.values.ratio).toBeCloseTo(0.5, 12);
  });

  it('flags K outside 1e−10 … 1e−2 m/s and not the usual monitoring-well range', () => {
    // common practice: plausible slug-test K 1e−10 … 1e−2 m/s
    const fast = analyzeRecord(input((t) => Math.exp(-t / 0.05), { dt: 0.0025 }));
    expect(fast.k.kMetersPerSecond).toBeCloseTo(0.01026, 5);
    expect(fast.flags.find((f) => f.code === 'k-implausible')?.message).toBe(
      'K = 1.03e-2 m/s is outside 1.00e-10 … 1.00e-2 m/s, the plausible range for a slug test.',
    );
    const justInside = analyzeRecord(input((t) => Math.exp(-t / 0.08), { dt: 0.004 }));
    expect(justInside.k.kMetersPerSecond).toBeLessThan(1e-2);
    expect(codes(justInside)).not.toContain('k-implausible');
    // common practice: slug-test K at monitoring wells in unconsolidated sediments, about 1e−8 … 1e−4 m/s
    for (const t0 of [10, 30000]) {
      const usual = analyzeRecord({ ...input((t) => Math.exp(-t / t0), { dt: t0 / 20 }) });
      expect(usual.k.kMetersPerSecond).toBeGreaterThan(1e-8);
      expect(usual.k.kMetersPerSecond).toBeLessThan(1e-4);
      expect(codes(usual)).not.toContain('k-implausible');
    }
  });

  it('flags K outside the range of the stated material', () => {
    // Freeze & Cherry 1979, Table 2.2: clean sand 1e−6 … 1e−2 m/s
    const slow = analyzeRecord({ ...input((t) => Math.exp(-t / 3000), { dt: 150 }), material: 'clean-sand' });
    const flag = slow.flags.find((f) => f.code === 'k-outside-material');
    expect(flag?.values.minMetersPerSecond).toBe(1e-6);
    expect(flag?.reference).toBe('Freeze & Cherry (1979), Table 2.2');
    expect(codes(analyzeRecord({ ...input((t) => Math.exp(-t / 3000), { dt: 150 }), material: 'silt-loess' }))).not.toContain('k-outside-material');
  });

  it('lists the materials of Freeze & Cherry’s table with the ranges quoted in the method notes', () => {
    const range = (id: string) => {
      const m = MATERIALS.find((x) => x.id === id);
      return [m?.kMinMetersPerSecond, m?.kMaxMetersPerSecond];
    };
    // Freeze & Cherry 1979, Table 2.2 (as quoted in domain.md §4)
    expect(range('gravel')).toEqual([1e-3, 1]);
    expect(range('clean-sand')).toEqual([1e-6, 1e-2]);
    expect(range('silty-sand')).toEqual([1e-7, 1e-3]);
    expect(range('silt-loess')).toEqual([1e-9, 1e-5]);
    expect(range('glacial-till')).toEqual([1e-12, 1e-6]);
  });

  it('notes when the simplified Hvorslev form is outside its validity', () => {
    const short = analyzeRecord({ ...input((t) => Math.exp(-t / 30)), geometry: { casingRadiusM: 0.0254, screenRadiusM: 0.0254, screenLengthM: 0.1524 } });
    const flag = short.flags.find((f) => f.code === 'shape-factor-validity');
    expect(flag?.severity).toBe('info');
    expect(flag?.message).toContain('mL/D = 3 is not above 4');
    expect(codes(analyzeRecord(input((t) => Math.exp(-t / 30))))).not.toContain('shape-factor-validity');
  });

  it('flags repeat tests whose normalized curves disagree', () => {
    const reduce = (t0: number, h0: number) => reduceRecord(input((t) => Math.exp(-t / t0), { h0 }).record, { reference: 'vented', staticLevelM: 0 });
    expect(repeatTestFlags([{ label: 'test 1', reduced: reduce(30, 0.5) }, { label: 'test 2', reduced: reduce(30.6, 1.0) }])).toEqual([]);
    const [flag] = repeatTestFlags([
      { label: 'test 1', reduced: reduce(30, 0.5) },
      { label: 'test 2', reduced: reduce(45, 1.5) },
    ]);
    expect(flag.code).toBe('repeat-tests-disagree');
    expect(flag.values.spread).toBeCloseTo(0.5, 2);
    expect(flag.values.slowestLabel).toBe('test 2');
    expect(flag.values.slowestH0M).toBe(1.5);
  });
});
