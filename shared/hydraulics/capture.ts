/** Extraction-well screening: Javandel & Tsang (1986), Cooper & Jacob (1946), plane head gradient. */

export interface CaptureParams {
  rateM3PerS: number;
  thicknessM: number;
  kMetersPerSecond: number;
  gradient: number;
}

export interface CaptureZone {
  darcyVelocityMPerS: number;
  stagnationPointM: number;
  captureWidthAtWellM: number;
  captureWidthFarM: number;
}

function positive(values: Record<string, number>): void {
  for (const [name, v] of Object.entries(values)) {
    if (!(Number.isFinite(v) && v > 0)) throw new Error(`${name} must be a number greater than 0 (got ${v})`);
  }
}

/** Javandel & Tsang (1986): one well pumping Q from a confined layer of thickness b in uniform flow U = K·i. */
export function captureZone(p: CaptureParams): CaptureZone {
  const { rateM3PerS: q, thicknessM: b, kMetersPerSecond: k, gradient: i } = p;
  positive({ rateM3PerS: q, thicknessM: b, kMetersPerSecond: k, gradient: i });
  const u = k * i;
  return {
    darcyVelocityMPerS: u,
    stagnationPointM: q / (2 * Math.PI * b * u),
    captureWidthAtWellM: q / (2 * b * u),
    captureWidthFarM: q / (b * u),
  };
}

/**
 * The dividing streamline as a closed counter-clockwise ring, in a frame where the flow goes toward +x
 * (well at the origin, stagnation point at +x), truncated at x = −upgradientLengthM (default twice the
 * far width). With θ = atan2(y, x) ∈ [0, π) the upper branch is y = (Q/(2πbU))·θ, i.e.
 * x = y / tan(2πbU·y/Q) — Javandel & Tsang's dividing streamline written in this frame; the lower branch is
 * its mirror. `samples` vertices per branch, spaced evenly along the curve.
 */
export function captureEnvelope(p: CaptureParams, upgradientLengthM?: number, samples = 200): [number, number][] {
  const zone = captureZone(p);
  const a = zone.stagnationPointM;
  const length = upgradientLengthM ?? 2 * zone.captureWidthFarM;
  positive({ upgradientLengthM: length });
  if (!(Number.isInteger(samples) && samples >= 3)) throw new Error(`samples must be a whole number ≥ 3 (got ${samples})`);

  const xOf = (t: number) => (t === 0 ? a : (a * t) / Math.tan(t));
  // x(θ) falls monotonically from a to −∞ on [0, π): bisect for x = −length
  let lo = Math.PI / 2;
  let hi = Math.PI;
  for (let it = 0; it < 200 && hi - lo > 1e-16; it++) {
    const mid = (lo + hi) / 2;
    if (xOf(mid) > -length) lo = mid;
    else hi = mid;
  }
  const thetaMax = lo;

  const dense = 4096;
  const cum = new Float64Array(dense + 1);
  let px = xOf(0);
  let py = 0;
  for (let j = 1; j <= dense; j++) {
    const t = (thetaMax * j) / dense;
    const x = xOf(t);
    const y = a * t;
    cum[j] = cum[j - 1] + Math.hypot(x - px, y - py);
    px = x;
    py = y;
  }
  const upper: [number, number][] = [];
  let seg = 0;
  for (let s = 0; s < samples; s++) {
    let t: number;
    if (s === 0) t = 0;
    else if (s === samples - 1) t = thetaMax;
    else {
      const target = (cum[dense] * s) / (samples - 1);
      while (cum[seg + 1] < target) seg++;
      const f = (target - cum[seg]) / (cum[seg + 1] - cum[seg]);
      t = (thetaMax * (seg + f)) / dense;
    }
    upper.push([s === samples - 1 ? -length : xOf(t), a * t]);
  }

  const ring: [number, number][] = [];
  for (let s = samples - 1; s >= 0; s--) ring.push([upper[s][0], s === 0 ? 0 : -upper[s][1]]);
  for (let s = 1; s < samples; s++) ring.push(upper[s]);
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/**
 * Turns local (x along the flow, y to its left) offsets into grid (east, north) offsets for a flow
 * toward `flowDirectionDeg`, clockwise from grid north.
 */
export function rotateToFlow(points: [number, number][], flowDirectionDeg: number): [number, number][] {
  if (!Number.isFinite(flowDirectionDeg)) throw new Error(`Flow direction must be a number of degrees (got ${flowDirectionDeg})`);
  const rad = (flowDirectionDeg * Math.PI) / 180;
  const s = Math.sin(rad);
  const c = Math.cos(rad);
  return points.map(([x, y]) => [x * s - y * c, x * c + y * s]);
}

export interface CooperJacobParams {
  rateM3PerS: number;
  transmissivityM2PerS: number;
  storativity: number;
  radiusM: number;
  timeS: number;
}

/** Cooper & Jacob (1946): s = Q/(4πT)·ln(2.25 T t/(r² S)); valid when u = r²S/(4Tt) < 0.01 (common practice). */
export function cooperJacob(p: CooperJacobParams): { drawdownM: number; u: number; valid: boolean } {
  const { rateM3PerS: q, transmissivityM2PerS: t, storativity: s, radiusM: r, timeS: time } = p;
  positive({ rateM3PerS: q, transmissivityM2PerS: t, storativity: s, radiusM: r, timeS: time });
  const u = (r * r * s) / (4 * t * time);
  // when u is large the logarithm turns negative: the figure is then meaningless, and `valid` says so
  const drawdownM = (q / (4 * Math.PI * t)) * Math.log((2.25 * t * time) / (r * r * s));
  return { drawdownM, u, valid: u < 0.01 };
}

export interface HeadGradient {
  magnitude: number;
  flowDirectionDeg: number;
  fit: { a: number; b: number; c: number; rmsM: number };
}

/**
 * Least-squares plane h = a·x + b·y + c through three or more heads (exact for three). Flow follows −∇h;
 * its direction is given in degrees clockwise from +y (grid north), in [0, 360); 0 for a flat plane.
 */
export function headGradient(points: { x: number; y: number; head: number }[]): HeadGradient {
  if (points.length < 3) throw new Error(`A head gradient needs at least three wells with a water level (got ${points.length})`);
  for (const q of points) {
    if (!(Number.isFinite(q.x) && Number.isFinite(q.y) && Number.isFinite(q.head))) throw new Error('Every well needs a finite x, y and head');
  }
  const n = points.length;
  let mx = 0;
  let my = 0;
  let mh = 0;
  for (const q of points) {
    mx += q.x / n;
    my += q.y / n;
    mh += q.head / n;
  }
  // centred sums: projected coordinates are large, and the normal equations lose digits without this
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  let sxh = 0;
  let syh = 0;
  for (const q of points) {
    const dx = q.x - mx;
    const dy = q.y - my;
    const dh = q.head - mh;
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
    sxh += dx * dh;
    syh += dy * dh;
  }
  const det = sxx * syy - sxy * sxy;
  if (!(det > 1e-10 * sxx * syy) || sxx === 0 || syy === 0) {
    throw new Error('The wells lie on one line (or at one place): a plane of heads needs wells spread in two directions');
  }
  const a = (sxh * syy - syh * sxy) / det;
  const b = (syh * sxx - sxh * sxy) / det;
  const c = mh - a * mx - b * my;
  let ss = 0;
  for (const q of points) {
    const res = q.head - (a * q.x + b * q.y + c);
    ss += res * res;
  }
  const magnitude = Math.hypot(a, b);
  let flowDirectionDeg = magnitude === 0 ? 0 : (Math.atan2(-a, -b) * 180) / Math.PI;
  if (flowDirectionDeg < 0) flowDirectionDeg += 360;
  if (flowDirectionDeg >= 360) flowDirectionDeg -= 360;
  return { magnitude, flowDirectionDeg, fit: { a, b, c, rmsM: Math.sqrt(ss / n) } };
}
