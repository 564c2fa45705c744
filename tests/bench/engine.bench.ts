import { analyzeRecord, type AnalyzeInput } from '../../shared/hydraulics/analyze';
import { fitLine } from '../../shared/hydraulics/fitting';
import { reduceRecord } from '../../shared/hydraulics/reduction';

const SAMPLES = 1_000_000;
const WARM_UP = 3;
const RUNS = 11;
const TARGET_MS = 150;

/** A 10 Hz logger record of a bail-down: 60 s before the step, T0 = 900 s, 0.5 mm of noise. */
function record(): AnalyzeInput['record'] {
  const timeSeconds = new Float64Array(SAMPLES);
  const value = new Float64Array(SAMPLES);
  let seed = 12345;
  for (let i = 0; i < SAMPLES; i++) {
    const t = i * 0.1;
    seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
    const noise = (seed / 4294967296 - 0.5) * 1e-3;
    timeSeconds[i] = t;
    value[i] = (t < 60 ? 12 : 12 + 0.8 * Math.exp(-(t - 60) / 900)) + noise;
  }
  return { timeSeconds, value };
}

function medianMs(task: () => unknown): number {
  for (let i = 0; i < WARM_UP; i++) task();
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const start = performance.now();
    task();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return times[(RUNS - 1) / 2];
}

export async function run(): Promise<void> {
  const rec = record();
  const input: AnalyzeInput = {
    record: rec,
    reduction: { reference: 'depth' },
    method: 'hvorslev',
    geometry: { casingRadiusM: 0.0254, screenRadiusM: 0.0254, screenLengthM: 3 },
  };

  let sink = 0;
  const floorMs = medianMs(() => {
    const { timeSeconds: t, value: v } = rec;
    let sum = 0;
    for (let i = 0; i < v.length; i++) sum += v[i] + t[i];
    sink += sum;
  });
  const reduceFitMs = medianMs(() => {
    const reduced = reduceRecord(rec, input.reduction);
    sink += fitLine(reduced, { method: 'hvorslev' }).t0Seconds;
  });
  const analyzeMs = medianMs(() => {
    sink += analyzeRecord(input).k.kMetersPerSecond;
  });
  const check = analyzeRecord(input);

  const fmt = (ms: number) => `${ms.toFixed(1).padStart(7)} ms`;
  console.log(`engine, ${SAMPLES.toLocaleString('en-US')} samples, median of ${RUNS} runs after ${WARM_UP} warm-up runs`);
  console.log(`  plain Float64Array pass (floor)      ${fmt(floorMs)}`);
  console.log(`  reduce + fit                         ${fmt(reduceFitMs)}   ${(reduceFitMs / floorMs).toFixed(1)}× the floor`);
  console.log(`  analyzeRecord (reduce, QC, fit, K)   ${fmt(analyzeMs)}   ${(analyzeMs / floorMs).toFixed(1)}× the floor`);
  console.log(`  target < ${TARGET_MS} ms: ${analyzeMs < TARGET_MS ? 'met' : 'NOT met'}  (T0 = ${check.fit.t0Seconds.toFixed(1)} s, ${check.fit.count} readings in the window)`);
  if (sink === 0.5) console.log('');
}
