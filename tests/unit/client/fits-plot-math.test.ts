import { describe, expect, it } from 'vitest';
import { decadeLabel, dragRange, headDomain, hitTestWindow, logTicks, panView, zoomView } from '@/features/fits/plot-math';

describe('log axis of H/H0', () => {
  it('labels every decade as a geologist writes it and puts 2…9 between them', () => {
    const { decades, minor } = logTicks(0.01, 1.2);
    expect(decades.map((d) => d.label)).toEqual(['0.01', '0.1', '1']);
    expect(minor.filter((v) => v < 0.1)).toEqual([0.02, 0.03, 0.04, 0.05, 0.06, 0.07, 0.08, 0.09]);
    expect(minor.filter((v) => v > 0.1 && v < 1)).toHaveLength(8);
    expect(minor.filter((v) => v > 1)).toEqual([]);
  });

  it('writes decades below 0.001 with a power of ten', () => {
    expect(decadeLabel(0.001)).toBe('0.001');
    expect(decadeLabel(1e-4)).toBe('10⁻⁴');
    expect(decadeLabel(10)).toBe('10');
  });

  it('spans from the decade below the smallest head to just above 1, never below 1e−4', () => {
    expect(headDomain([1, 0.5, 0.03, 0, -0.01])).toEqual([0.01, 1.2]);
    expect(headDomain([1, 1e-7])[0]).toBe(1e-4);
    expect(headDomain([1.3, 0.2])[1]).toBeCloseTo(1.43, 6);
  });
});

describe('dragging the fitting window', () => {
  const window = { fromSeconds: 10, toSeconds: 40 };

  it('picks the edge within the tolerance, the inside to move, and outside to draw anew', () => {
    expect(hitTestWindow(103, 100, 300)).toBe('from');
    expect(hitTestWindow(296, 100, 300)).toBe('to');
    expect(hitTestWindow(200, 100, 300)).toBe('move');
    expect(hitTestWindow(50, 100, 300)).toBe('new');
    expect(hitTestWindow(50, null, null)).toBe('new');
  });

  it('moves one edge and swaps the edges when they cross', () => {
    expect(dragRange('to', window, 40, 55, [0, 100])).toEqual({ fromSeconds: 10, toSeconds: 55 });
    expect(dragRange('from', window, 10, 60, [0, 100])).toEqual({ fromSeconds: 40, toSeconds: 60 });
  });

  it('draws a new window from where the drag started, in either direction, inside the record', () => {
    expect(dragRange('new', window, 70, 50, [0, 100])).toEqual({ fromSeconds: 50, toSeconds: 70 });
    expect(dragRange('new', null, 5, 130, [0, 100])).toEqual({ fromSeconds: 5, toSeconds: 100 });
  });

  it('moves the whole window and keeps its width at the ends of the record', () => {
    expect(dragRange('move', window, 20, 25, [0, 100])).toEqual({ fromSeconds: 15, toSeconds: 45 });
    expect(dragRange('move', window, 20, 200, [0, 100])).toEqual({ fromSeconds: 70, toSeconds: 100 });
    expect(dragRange('move', window, 20, -50, [0, 100])).toEqual({ fromSeconds: 0, toSeconds: 30 });
  });
});

describe('zoom and pan of the time axis', () => {
  it('zooms about the pointer and never beyond the whole record', () => {
    expect(zoomView([0, 100], 0.5, 50, [0, 100])).toEqual([25, 75]);
    expect(zoomView([0, 100], 0.5, 0, [0, 100])).toEqual([0, 50]);
    expect(zoomView([20, 40], 10, 30, [0, 100])).toEqual([0, 100]);
  });

  it('pans within the record', () => {
    expect(panView([20, 40], 10, [0, 100])).toEqual([30, 50]);
    expect(panView([20, 40], 100, [0, 100])).toEqual([80, 100]);
    expect(panView([20, 40], -100, [0, 100])).toEqual([0, 20]);
  });
});
