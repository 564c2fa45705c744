import { describe, expect, it } from 'vitest';
import proj4 from 'proj4';
import { distance } from '@turf/turf';
import { localProjection } from '@shared/geo/local-crs';

describe('local projection for a geographic site', () => {
  it.each([
    [7.44, 46.95],
    [-122.3, 47.6],
    [151.2, -33.9],
    [0, 0],
  ])('puts (%d, %d) at the origin and keeps distances in metres nearby', (lon, lat) => {
    const def = localProjection(lon, lat);
    expect(def).toMatch(/\+units=m/);
    const [x0, y0] = proj4('WGS84', def, [lon, lat]);
    expect(Math.abs(x0)).toBeLessThan(1e-6);
    expect(Math.abs(y0)).toBeLessThan(1e-6);
    const other: [number, number] = [lon + 0.02, lat + 0.015];
    const [x, y] = proj4('WGS84', def, other);
    const metres = distance([lon, lat], other, { units: 'meters' });
    // turf uses a sphere; within 0.5 % of the ellipsoidal distance
    expect(Math.abs(Math.hypot(x, y) - metres) / metres).toBeLessThan(5e-3);
    const [lon2, lat2] = proj4(def, 'WGS84', [x, y]);
    expect(lon2).toBeCloseTo(other[0], 9);
    expect(lat2).toBeCloseTo(other[1], 9);
  });

  it('refuses a position outside lon −180…180, lat −90…90', () => {
    expect(() => localProjection(200, 10)).toThrow(/longitude/i);
    expect(() => localProjection(10, 95)).toThrow(/latitude/i);
  });
});
