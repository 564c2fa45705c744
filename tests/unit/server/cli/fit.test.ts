import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { CliUsageError, main } from '../../../../server/cli/fit';
import { EngineInputError, OscillatingResponseError } from '@shared/hydraulics/errors';

const fixture = fileURLToPath(new URL('../../../fixtures/synthetic-slug.csv', import.meta.url));
const hvorslev = ['--method', 'hvorslev', '--rc', '0.0254', '--R', '0.0254', '--L', '3'];

describe('the fit command line', () => {
  it('prints the known K of the synthetic slug test', () => {
    // tests/fixtures/synthetic-slug.csv is invented with K = 1.0e−5 m/s (Hvorslev 1951, case G), rounded to 1e−6 m: ±0.05 %
    const out = main([fixture, ...hvorslev]);
    expect(out).toContain('K = 1.000e-5 m/s = 0.864 m/d');
    expect(out).toContain('T0 = 51.31 s');
    expect(out).toContain('Window: H/H0 0.25–0.15 (recommended), 26 readings');
    expect(out).toContain('Static level: 2 m (mean of 10 pre-test readings)');
    expect(out).toContain('Flags: none');
  });

  it('reads the same record written in feet with a timestamp column and gives the same K', () => {
    const rows = readFileSync(fixture, 'utf8')
      .split('\n')
      .filter((l) => /^\d/.test(l))
      .map((l) => {
        const [t, d] = l.split(',').map(Number);
        const stamp = new Date(Date.UTC(2024, 6, 4, 17, 0, t)).toISOString().slice(0, 19).replace('T', ' ');
        return `${stamp};${(d / 0.3048).toFixed(9).replace('.', ',')}`;
      });
    const csv = ['Date and time;Depth (ft)', ...rows].join('\n');
    const out = main(
      ['record.csv', '--method', 'hvorslev', '--units', 'ft', '--geometry-units', 'm', '--rc', '0.0254', '--R', '0.0254', '--L', '3', '--time-unit', 'timestamp', '--time-zone', 'America/Chicago'],
      { readFile: () => csv },
    );
    expect(out).toContain('K = 1.000e-5 m/s = 2.835 ft/d');
    expect(out).toContain('Test start: 2024-07-04T22:00:10.000Z (detected)');
  });

  it('reads a vented record in psi as head P / (ρ g) with the density, the static level in psi too, and gives the same K', () => {
    // The depth fixture as a vented sensor 10 m below the measuring point: head = 10 − depth (m), written in psi (1 psi = 6894.757 Pa, NIST SP 811).
    const psiPer = (headM: number, rho: number) => (headM * rho * 9.80665) / 6894.757293168;
    const rows = readFileSync(fixture, 'utf8').split('\n').filter((l) => /^\d/.test(l)).map((l) => l.split(',').map(Number));
    for (const rho of [1000, 998.2071]) {
      const csv = ['t (s),p (psi)', ...rows.map(([t, d]) => `${t},${psiPer(10 - d, rho).toFixed(9)}`)].join('\n');
      const args = ['vented.csv', ...hvorslev, '--reference', 'vented', '--pressure-unit', 'psi', '--density', String(rho)];
      expect(main(args, { readFile: () => csv })).toContain('K = 1.000e-5 m/s');
      const withStatic = main([...args, '--static', String(psiPer(8, rho))], { readFile: () => csv });
      expect(withStatic).toContain('K = 1.000e-5 m/s');
      expect(withStatic).toMatch(/Static level: 8 m \(entered\)/);
    }
  });

  it('refuses a pressure unit for a depth record', () => {
    expect(() => main([fixture, ...hvorslev, '--pressure-unit', 'kPa'])).toThrow(/--pressure-unit: a depth below the measuring point is a length/);
  });

  it('prints the flags of a fit outside the recommended window', () => {
    const out = main([fixture, ...hvorslev, '--window-head', '1,0.5', '--line', 'free']);
    expect(out).toContain('[warning] window-outside-recommended: The window spans H/H0 1–0.5');
  });

  it('prints Bouwer-Rice shape terms', () => {
    const out = main([fixture, '--method', 'bouwer-rice', '--rc', '0.0254', '--R', '0.0254', '--rw', '0.1', '--L', '3', '--Lw', '5', '--D', '20']);
    expect(out).toMatch(/Shape: Le\/rw = 30, ln\(Re\/rw\) = 2\.335, partial penetration/);
  });

  it('reports an invalid input by the engine’s field and message', () => {
    expect(() => main([fixture, '--method', 'hvorslev', '--rc', '0', '--R', '0.0254', '--L', '3'])).toThrow(EngineInputError);
    expect(() => main([fixture, '--method', 'hvorslev', '--rc', '0', '--R', '0.0254', '--L', '3'])).toThrow('geometry.casingRadiusM: must be greater than 0 (got 0)');
  });

  it('asks for the method and the geometry', () => {
    expect(() => main([fixture, '--rc', '0.0254'])).toThrow(CliUsageError);
    expect(() => main([fixture, '--method', 'hvorslev', '--R', '0.0254', '--L', '3'])).toThrow('--rc is required');
  });

  it('refuses an oscillating record unless told to fit it', () => {
    const csv = ['t,h', ...Array.from({ length: 200 }, (_, t) => `${t},${(-0.5 * Math.exp(-t / 40) * Math.cos((2 * Math.PI * t) / 25)).toFixed(6)}`)].join('\n');
    const args = ['osc.csv', ...hvorslev, '--reference', 'vented', '--static', '0'];
    expect(() => main(args, { readFile: () => csv })).toThrow(OscillatingResponseError);
    expect(main([...args, '--allow-oscillation', '--window-time', '0,5'], { readFile: () => csv })).toContain('[error] oscillation: The response oscillates');
  });

  it('prints its usage on --help', () => {
    expect(main(['--help'])).toMatch(/^Usage: npm run fit -- <record\.csv> --method hvorslev\|bouwer-rice/);
  });
});
