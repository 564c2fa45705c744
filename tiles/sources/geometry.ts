/*
 * Small plane-geometry helpers for generating the invented demo area. Coordinates are metres
 * east and north of the demo origin (see demo-area.ts); everything is deterministic.
 */
export type Pt = [number, number];
export type Ring = Pt[];

/** mulberry32: a tiny seeded generator, so the invented area is the same on every build. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export const between = (rand: () => number, lo: number, hi: number) => lo + (hi - lo) * rand();

/** Chaikin corner cutting: a smooth curve through a few control points (ends kept). */
export function smooth(points: Pt[], iterations = 3): Pt[] {
  let pts = points;
  for (let k = 0; k < iterations; k++) {
    const out: Pt[] = [pts[0]];
    for (let i = 0; i < pts.length - 1; i++) {
      const [ax, ay] = pts[i];
      const [bx, by] = pts[i + 1];
      out.push([0.75 * ax + 0.25 * bx, 0.75 * ay + 0.25 * by], [0.25 * ax + 0.75 * bx, 0.25 * ay + 0.75 * by]);
    }
    out.push(pts[pts.length - 1]);
    pts = out;
  }
  return pts;
}

/** The same for a closed ring (first point not repeated). */
export function smoothRing(ring: Ring, iterations = 2): Ring {
  let pts = ring;
  for (let k = 0; k < iterations; k++) {
    const out: Pt[] = [];
    for (let i = 0; i < pts.length; i++) {
      const [ax, ay] = pts[i];
      const [bx, by] = pts[(i + 1) % pts.length];
      out.push([0.75 * ax + 0.25 * bx, 0.75 * ay + 0.25 * by], [0.25 * ax + 0.75 * bx, 0.25 * ay + 0.75 * by]);
    }
    pts = out;
  }
  return pts;
}

export function distToSegment(p: Pt, a: Pt, b: Pt): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
  return Math.hypot(p[0] - (a[0] + t * dx), p[1] - (a[1] + t * dy));
}

export function distToLine(p: Pt, line: Pt[]): number {
  let d = Infinity;
  for (let i = 0; i < line.length - 1; i++) d = Math.min(d, distToSegment(p, line[i], line[i + 1]));
  return d;
}

export function inside(p: Pt, ring: Ring): boolean {
  let c = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) c = !c;
  }
  return c;
}

/** A polygon around a polyline: the line offset by halfWidth(i) to each side. */
export function ribbon(line: Pt[], halfWidth: (i: number) => number): Ring {
  const left: Pt[] = [];
  const right: Pt[] = [];
  for (let i = 0; i < line.length; i++) {
    const a = line[Math.max(0, i - 1)];
    const b = line[Math.min(line.length - 1, i + 1)];
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    const nx = -(b[1] - a[1]) / len;
    const ny = (b[0] - a[0]) / len;
    const w = halfWidth(i);
    left.push([line[i][0] + nx * w, line[i][1] + ny * w]);
    right.push([line[i][0] - nx * w, line[i][1] - ny * w]);
  }
  return [...left, ...right.reverse()];
}

/** An irregular closed blob: a circle whose radius wobbles with a few seeded harmonics. */
export function blob(cx: number, cy: number, rx: number, ry: number, rand: () => number, points = 28, rotation = 0): Ring {
  const harmonics = [2, 3, 5].map((k) => ({ k, amp: between(rand, 0.04, 0.12), phase: between(rand, 0, 2 * Math.PI) }));
  const ring: Ring = [];
  const cos = Math.cos(rotation);
  const sin = Math.sin(rotation);
  for (let i = 0; i < points; i++) {
    const a = (2 * Math.PI * i) / points;
    const f = 1 + harmonics.reduce((s, h) => s + h.amp * Math.sin(h.k * a + h.phase), 0);
    const x = rx * f * Math.cos(a);
    const y = ry * f * Math.sin(a);
    ring.push([cx + x * cos - y * sin, cy + x * sin + y * cos]);
  }
  return ring;
}

/** A rectangle centred on c, w along direction angle, d across it. */
export function rect(c: Pt, w: number, d: number, angle: number): Ring {
  const ux = Math.cos(angle);
  const uy = Math.sin(angle);
  const hw = w / 2;
  const hd = d / 2;
  return [
    [c[0] - ux * hw + uy * hd, c[1] - uy * hw - ux * hd],
    [c[0] + ux * hw + uy * hd, c[1] + uy * hw - ux * hd],
    [c[0] + ux * hw - uy * hd, c[1] + uy * hw + ux * hd],
    [c[0] - ux * hw - uy * hd, c[1] - uy * hw + ux * hd],
  ];
}

export function circle(c: Pt, r: number, points = 20): Ring {
  return Array.from({ length: points }, (_, i): Pt => [c[0] + r * Math.cos((2 * Math.PI * i) / points), c[1] + r * Math.sin((2 * Math.PI * i) / points)]);
}

export function lineLength(line: Pt[]): number {
  let s = 0;
  for (let i = 0; i < line.length - 1; i++) s += Math.hypot(line[i + 1][0] - line[i][0], line[i + 1][1] - line[i][1]);
  return s;
}

/** Point and unit direction at distance s along a polyline. */
export function along(line: Pt[], s: number): { p: Pt; dir: Pt } {
  let rest = s;
  for (let i = 0; i < line.length - 1; i++) {
    const a = line[i];
    const b = line[i + 1];
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    if (rest <= len || i === line.length - 2) {
      const t = len === 0 ? 0 : Math.min(1, rest / len);
      return { p: [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])], dir: [(b[0] - a[0]) / (len || 1), (b[1] - a[1]) / (len || 1)] };
    }
    rest -= len;
  }
  return { p: line[line.length - 1], dir: [1, 0] };
}

/** A uniform spatial hash of segments, for "is anything within d metres" questions. */
export class SegmentIndex {
  private cells = new Map<string, [Pt, Pt, number][]>();
  constructor(private readonly cell = 60) {}

  private key(ix: number, iy: number) {
    return `${ix},${iy}`;
  }

  add(line: Pt[], id: number): void {
    for (let i = 0; i < line.length - 1; i++) {
      const a = line[i];
      const b = line[i + 1];
      const x0 = Math.floor(Math.min(a[0], b[0]) / this.cell);
      const x1 = Math.floor(Math.max(a[0], b[0]) / this.cell);
      const y0 = Math.floor(Math.min(a[1], b[1]) / this.cell);
      const y1 = Math.floor(Math.max(a[1], b[1]) / this.cell);
      for (let ix = x0; ix <= x1; ix++) {
        for (let iy = y0; iy <= y1; iy++) {
          const k = this.key(ix, iy);
          const list = this.cells.get(k) ?? [];
          list.push([a, b, id]);
          this.cells.set(k, list);
        }
      }
    }
  }

  /** Distance to the nearest segment not belonging to `except`, looking at most `reach` metres. */
  nearest(p: Pt, reach: number, except = -1): number {
    let d = Infinity;
    const r = Math.ceil(reach / this.cell);
    const ix = Math.floor(p[0] / this.cell);
    const iy = Math.floor(p[1] / this.cell);
    for (let x = ix - r; x <= ix + r; x++) {
      for (let y = iy - r; y <= iy + r; y++) {
        for (const [a, b, id] of this.cells.get(this.key(x, y)) ?? []) {
          if (id !== except) d = Math.min(d, distToSegment(p, a, b));
        }
      }
    }
    return d;
  }
}

/** A spatial hash of points, for keeping buildings apart. */
export class PointIndex {
  private cells = new Map<string, Pt[]>();
  constructor(private readonly cell = 30) {}

  add(p: Pt): void {
    const k = `${Math.floor(p[0] / this.cell)},${Math.floor(p[1] / this.cell)}`;
    const list = this.cells.get(k) ?? [];
    list.push(p);
    this.cells.set(k, list);
  }

  anyWithin(p: Pt, d: number): boolean {
    const ix = Math.floor(p[0] / this.cell);
    const iy = Math.floor(p[1] / this.cell);
    const r = Math.ceil(d / this.cell);
    for (let x = ix - r; x <= ix + r; x++) {
      for (let y = iy - r; y <= iy + r; y++) {
        for (const q of this.cells.get(`${x},${y}`) ?? []) if (Math.hypot(q[0] - p[0], q[1] - p[1]) < d) return true;
      }
    }
    return false;
  }
}
