// @vitest-environment happy-dom
import { act } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { FitPlot } from '@/features/fits/components/fit-plot';
import { cleanup, render } from './helpers';

afterEach(async () => {
  await cleanup();
});

const t = Array.from({ length: 101 }, (_, i) => i);
const h = t.map((s) => Math.exp(-s / 20));

function plot(onWindowChange?: (r: { fromSeconds: number; toSeconds: number }) => void) {
  return (
    <FitPlot
      elapsedSeconds={t}
      normalizedHead={h}
      method="hvorslev"
      window={{ fromSeconds: 28, toSeconds: 38 }}
      onWindowChange={onWindowChange}
      inWindow={(s) => s >= 28 && s <= 38}
      line={{ intercept: 0, slopePerSecond: -1 / 20, lineCrossingSeconds: 20, recordCrossingSeconds: 20, anchored: true }}
      residuals={{ elapsedSeconds: [30, 35], residual: [0.001, -0.001] }}
      timeUnit="s"
      onTimeUnitChange={() => {}}
      label="test plot"
    />
  );
}

describe('fit plot', () => {
  it('labels the log axis by decades, marks 1/e and T0, and names the axes', async () => {
    const { container } = await render(plot());
    const texts = Array.from(container.querySelectorAll('svg text')).map((n) => n.textContent);
    // H/H0 falls to e^−5 ≈ 0.0067 over the record: decades 1, 0.1 and 0.01 plus 0.001 below.
    expect(texts).toEqual(expect.arrayContaining(['1', '0.1', '0.01', '0.001', '1/e = 0.37', 'T0 = 20 s', 'Normalized head H/H0 (log)', 'Time since the test start (s)']));
    expect(container.querySelector('[data-testid="fitted-line"]')).not.toBeNull();
    expect(container.querySelector('[data-testid="recommended-range"]')).not.toBeNull();
  });

  it('moves a window edge from the keyboard, by 1 % of the view per arrow key', async () => {
    const onWindowChange = vi.fn();
    const { container } = await render(plot(onWindowChange));
    const end = container.querySelector('[role="slider"][aria-label="Window end"]') as SVGElement;
    expect(end.getAttribute('aria-valuetext')).toBe('38 s');
    await act(async () => {
      end.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    });
    const range = onWindowChange.mock.calls.at(-1)?.[0];
    // This record recovers over most of its length, so the view is the whole record: 100 s + 3 %.
    expect(range.fromSeconds).toBe(28);
    expect(range.toSeconds).toBeCloseTo(38 + 1.03, 6);
  });

  it('opens on the recovery, not on a long tail of readings at static', async () => {
    const long = Array.from({ length: 1001 }, (_, i) => i);
    const { container } = await render(
      <FitPlot
        elapsedSeconds={long}
        normalizedHead={long.map((s) => Math.max(1e-3, Math.exp(-s / 20)))}
        method="hvorslev"
        window={null}
        inWindow={() => false}
        line={null}
        residuals={null}
        timeUnit="s"
        onTimeUnitChange={() => {}}
        label="long record"
      />,
    );
    const svg = container.querySelector('svg[data-view-to-seconds]')!;
    // H/H0 first reaches 0.01 at t = 93 s; the view ends 40 % later.
    expect(Number(svg.getAttribute('data-view-to-seconds'))).toBeCloseTo(130.2, 6);
  });

  it('shows every reading on a linear axis, readings below static included, when asked', async () => {
    const { container } = await render(
      <FitPlot
        elapsedSeconds={t.filter((_, i) => i < 30)}
        normalizedHead={h.filter((_, i) => i < 30)}
        linearSeries={{ elapsedSeconds: t, normalizedHead: t.map((s) => Math.exp(-s / 20) * Math.cos(s / 5)) }}
        method="hvorslev"
        window={null}
        inWindow={() => false}
        line={null}
        residuals={null}
        timeUnit="s"
        onTimeUnitChange={() => {}}
        label="oscillating"
      />,
    );
    const linear = Array.from(container.querySelectorAll('button[role="radio"]')).find((b) => b.textContent === 'Linear') as HTMLButtonElement;
    await act(async () => linear.click());
    const texts = Array.from(container.querySelectorAll('svg text')).map((n) => n.textContent);
    expect(texts).toEqual(expect.arrayContaining(['Normalized head H/H0 (linear)', 'static level (H/H0 = 0)', '−0.4', '1']));
    // All 101 readings are drawn, the negative ones too (the log series held only 30).
    expect(container.querySelector('[data-testid="readings-outside"]')!.getAttribute('d')!.split('M').length - 1).toBe(101);
  });

  it('draws no handles and takes no window when read-only', async () => {
    const { container } = await render(plot());
    expect(container.querySelectorAll('[role="slider"]')).toHaveLength(0);
    expect(container.textContent).not.toContain('Drag across the plot');
  });
});
