import { describe, expect, it } from 'vitest';
import { DEMO_SITE } from '../../../server/db/seed/demo';
import { DEMO_WELL_ROWS, demoChannelWeight, demoTrueK, demoWellInputs } from '../../../server/db/seed/demo-wells';
import { wellFormSchemaFor } from '@shared/schemas/wells';

describe('the invented demo wells', () => {
  it('are 24 wells with unique names, within 600 m of the invented site centre, and pass the well checks', () => {
    expect(DEMO_WELL_ROWS).toHaveLength(24);
    expect(new Set(DEMO_WELL_ROWS.map((r) => r[0])).size).toBe(24);
    for (const [, x, y] of DEMO_WELL_ROWS) expect(Math.hypot(x - 512000, y - 5290000)).toBeLessThan(600);
    const schema = wellFormSchemaFor(DEMO_SITE.hydroUnits);
    for (const input of demoWellInputs(DEMO_SITE.epsgCode)) {
      const r = schema.safeParse(input);
      expect(r.success, `${input.name}: ${r.error?.message}`).toBe(true);
      expect(input.notes).toMatch(/^Invented demo well/);
    }
  });

  it('have 2-inch and 4-inch casings and 3 to 6.1 m screens', () => {
    const radii = new Set(DEMO_WELL_ROWS.map((r) => r[7]));
    expect([...radii].sort()).toEqual([0.0254, 0.0508]);
    for (const r of DEMO_WELL_ROWS) {
      const length = r[6] - r[5];
      expect(length).toBeGreaterThanOrEqual(3.04);
      expect(length).toBeLessThanOrEqual(6.11);
    }
  });

  it('label the wells inside the buried channel with its unit, and demoTrueK gives the invented K ranges', () => {
    for (const [name, x, y, , , , , , , unit] of DEMO_WELL_ROWS) {
      const k = demoTrueK(x, y, unit);
      if (unit === 'Buried channel gravel') {
        expect(demoChannelWeight(x, y), name).toBeGreaterThan(0.6);
        expect(k, name).toBeGreaterThan(4.5e-4);
        expect(k, name).toBeLessThanOrEqual(1e-3);
      } else if (unit === 'Silt') {
        expect(k, name).toBeGreaterThan(5e-8);
        expect(k, name).toBeLessThan(2e-7);
      } else {
        expect(k, name).toBeGreaterThanOrEqual(1e-5 * 0.99);
        // MW-18 sits on the channel's edge, between the two.
        expect(k, name).toBeLessThan(2e-4);
      }
    }
    // Far from the channel, the sand and gravel background: 1e-5 to 5e-5 m/s.
    for (let u = -600; u <= 600; u += 50) {
      for (let v = -600; v <= 600; v += 50) {
        const k = demoTrueK(512000 + u, 5290000 + v, 'Sand and gravel');
        if (demoChannelWeight(512000 + u, 5290000 + v) < 0.01) {
          expect(k).toBeGreaterThanOrEqual(0.99e-5);
          expect(k).toBeLessThanOrEqual(5.1e-5);
        }
        expect(k).toBeLessThanOrEqual(1e-3);
      }
    }
  });
});
