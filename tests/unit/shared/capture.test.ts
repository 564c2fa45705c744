import { beforeEach, describe, expect, it } from 'vitest';
import { captureEnvelope, captureZone, cooperJacob, headGradient, rotateToFlow } from '@shared/hydraulics/capture';

// domain.md §7 item 12, derived from Javandel & Tsang 1986
const jt = { rateM3PerS: 1e-3, thicknessM: 10, kMetersPerSecond: 1e-4, gradient: 0.005 };

/** Width of a closed ring at x: the span of its crossings of the vertical line. */
function widthAt(ring: [number, number][], x: number): number {
  const ys: number[] = [];
  for (let i = 0; i + 1 < ring.length; i++) {
    const [x1, y1] = ring[i];
    const [x2, y2] = ring[i + 1];
    if ((x1 <= x) !== (x2 <= x)) ys.push(y1 + ((x - x1) / (x2 - x1)) * (y2 - y1));
  }
  return Math.max(...ys) - Math.min(...ys);
}

describe('Javandel & Tsang capture zone', () => {
  it('gives 200.0 m far upgradient, 100.0 m at the well and the stagnation point at 31.83 m', () => {
    // domain.md §7 item 12, derived from Javandel & Tsang 1986
    const z = captureZone(jt);
    expect(z.darcyVelocityMPerS).toBeCloseTo(5e-7, 15);
    expect(z.captureWidthFarM).toBeCloseTo(200.0, 9);
    expect(z.captureWidthAtWellM).toBeCloseTo(100.0, 9);
    expect(z.stagnationPointM).toBeCloseTo(31.83, 2);
    expect(z.stagnationPointM).toBeCloseTo(100 / Math.PI, 9);
  });

  it('refuses a rate, thickness, K or gradient that is not positive', () => {
    for (const key of ['rateM3PerS', 'thicknessM', 'kMetersPerSecond', 'gradient'] as const) {
      expect(() => captureZone({ ...jt, [key]: 0 })).toThrow(/greater than 0/);
      expect(() => captureZone({ ...jt, [key]: Number.NaN })).toThrow(/greater than 0/);
    }
  });
});

describe('capture envelope (the dividing streamline)', () => {
  let z: ReturnType<typeof captureZone>;
  beforeEach(() => {
    z = captureZone(jt);
  });

  it('is a closed, counter-clockwise ring through the stagnation point', () => {
    const ring = captureEnvelope(jt);
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    const nose = ring.reduce((a, b) => (b[0] > a[0] ? b : a));
    expect(nose[0]).toBeCloseTo(z.stagnationPointM, 9);
    expect(nose[1]).toBeCloseTo(0, 9);
    let area2 = 0;
    for (let i = 0; i + 1 < ring.length; i++) area2 += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
    expect(area2).toBeGreaterThan(0);
  });

  it('is as wide as captureWidthAtWellM at the well', () => {
    // domain.md §7 item 12, derived from Javandel & Tsang 1986: 100.0 m
    expect(widthAt(captureEnvelope(jt, 1000, 400), 0)).toBeCloseTo(z.captureWidthAtWellM, 1);
  });

  it('tends to captureWidthFarM upgradient and is truncated at the given length', () => {
    const ring = captureEnvelope(jt, 20_000, 400);
    expect(Math.min(...ring.map((p) => p[0]))).toBeCloseTo(-20_000, 6);
    const w1 = widthAt(ring, -500);
    const w2 = widthAt(ring, -5000);
    const w3 = widthAt(ring, -19_000);
    expect(w1).toBeLessThan(w2);
    expect(w2).toBeLessThan(w3);
    expect(w3).toBeLessThan(z.captureWidthFarM);
    expect(z.captureWidthFarM - w3).toBeLessThan(1);
  });

  it('puts every vertex on the dividing streamline y = (Q/(2πbU))·θ', () => {
    const a = z.stagnationPointM;
    for (const [x, y] of captureEnvelope(jt, 800, 100)) {
      if (Math.abs(y) < 1e-12) continue;
      if (x === -800) continue;
      expect(Math.abs(y)).toBeCloseTo(a * Math.atan2(Math.abs(y), x), 6);
    }
  });

  it('has about the asked number of vertices, each branch sampled end to end', () => {
    const ring = captureEnvelope(jt, undefined, 50);
    expect(ring.length).toBeGreaterThanOrEqual(99);
    expect(ring.length).toBeLessThanOrEqual(102);
    expect(Math.min(...ring.map((p) => p[0]))).toBeCloseTo(-2 * z.captureWidthFarM, 6);
  });
});

describe('rotateToFlow', () => {
  const pts: [number, number][] = [
    [1, 0],
    [0, 1],
  ];
  it.each([
    [90, [1, 0], [0, 1]],
    [0, [0, 1], [-1, 0]],
    [180, [0, -1], [1, 0]],
    [270, [-1, 0], [0, -1]],
  ])('turns +x toward the flow direction %d° clockwise from north (the left bank stays left)', (deg, ex, ey) => {
    const [rx, ry] = rotateToFlow(pts, deg);
    expect(rx[0]).toBeCloseTo(ex[0], 12);
    expect(rx[1]).toBeCloseTo(ex[1], 12);
    expect(ry[0]).toBeCloseTo(ey[0], 12);
    expect(ry[1]).toBeCloseTo(ey[1], 12);
  });
  it('turns +x to the north-east at 45°', () => {
    const [[x, y]] = rotateToFlow([[Math.SQRT2, 0]], 45);
    expect(x).toBeCloseTo(1, 12);
    expect(y).toBeCloseTo(1, 12);
  });
});

describe('Cooper & Jacob drawdown', () => {
  it('gives 5.3293 m for Q = 0.01, T = 1e-3, S = 1e-4, r = 10 m, t = 3600 s', () => {
    // domain.md §7 item 13, derived from Cooper & Jacob 1946
    const r = cooperJacob({ rateM3PerS: 0.01, transmissivityM2PerS: 1e-3, storativity: 1e-4, radiusM: 10, timeS: 3600 });
    expect(r.drawdownM).toBeCloseTo(5.3293, 4);
    expect(r.u).toBeCloseTo((100 * 1e-4) / (4 * 1e-3 * 3600), 15);
    expect(r.valid).toBe(true);
  });
  it('says it is not valid when u ≥ 0.01 (common practice)', () => {
    const r = cooperJacob({ rateM3PerS: 0.01, transmissivityM2PerS: 1e-3, storativity: 1e-1, radiusM: 10, timeS: 3600 });
    expect(r.u).toBeGreaterThanOrEqual(0.01);
    expect(r.valid).toBe(false);
  });
  it('refuses inputs that are not positive', () => {
    expect(() => cooperJacob({ rateM3PerS: 0.01, transmissivityM2PerS: 0, storativity: 1e-4, radiusM: 10, timeS: 3600 })).toThrow(/greater than 0/);
  });
});

describe('plane head gradient', () => {
  const heads = (pts: [number, number][]) => pts.map(([x, y]) => ({ x, y, head: 10 - 0.002 * x + 0.001 * y }));

  it('returns magnitude sqrt(5)e-3 and flow toward 116.57° for h = 10 − 0.002x + 0.001y', () => {
    // derived: −∇h = (0.002, −0.001), east-south-east: atan2(0.002, −0.001) = 116.565°
    const g = headGradient(heads([
      [0, 0],
      [100, 0],
      [0, 100],
    ]));
    expect(g.magnitude).toBeCloseTo(Math.sqrt(5) * 1e-3, 12);
    expect(g.flowDirectionDeg).toBeCloseTo(116.565, 3);
    expect(g.fit.a).toBeCloseTo(-0.002, 12);
    expect(g.fit.b).toBeCloseTo(0.001, 12);
    expect(g.fit.c).toBeCloseTo(10, 9);
    expect(g.fit.rmsM).toBeCloseTo(0, 9);
  });

  it('fits a least-squares plane to more wells, far from the origin', () => {
    const pts = heads([
      [500_000, 5_200_000],
      [500_300, 5_200_050],
      [500_120, 5_200_400],
      [499_800, 5_200_200],
      [500_050, 5_199_700],
    ]);
    pts[2].head += 0.01;
    const g = headGradient(pts);
    expect(g.magnitude).toBeCloseTo(Math.sqrt(5) * 1e-3, 4);
    expect(g.fit.rmsM).toBeGreaterThan(0);
    expect(g.fit.rmsM).toBeLessThan(0.01);
  });

  it.each([
    [0, 'north', 0, -0.001],
    [90, 'east', -0.001, 0],
    [180, 'south', 0, 0.001],
    [270, 'west', 0.001, 0],
  ])('gives %d° for flow to the %s', (deg, _name, a, b) => {
    const g = headGradient([
      { x: 0, y: 0, head: 5 },
      { x: 10, y: 0, head: 5 + 10 * a },
      { x: 0, y: 10, head: 5 + 10 * b },
    ]);
    expect(g.flowDirectionDeg).toBeCloseTo(deg, 9);
  });

  it('refuses fewer than three wells and wells on one line, saying why', () => {
    expect(() => headGradient(heads([[0, 0], [1, 1]]))).toThrow(/at least three/);
    expect(() => headGradient(heads([[0, 0], [1, 1], [2, 2], [5, 5]]))).toThrow(/one line/);
    expect(() => headGradient(heads([[3, 3], [3, 3], [3, 3]]))).toThrow(/one line/);
  });
});
