import { featureCollection, interpolate, point } from '@turf/turf';
import { idwGrid, type GridSpec, type IdwPoint } from '../../shared/geo/idw';

const WELLS = 500;
const SIDE_M = 5000;
const TARGET_RATIO = 30;
const TARGET_KNN_MS = 1000;

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296);
}

function medianMs(runs: number, task: () => unknown): number {
  task();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    task();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return times[(runs - 1) >> 1];
}

export async function run(): Promise<void> {
  const rand = lcg(500);
  const wells: IdwPoint[] = Array.from({ length: WELLS }, () => ({ x: rand() * SIDE_M, y: rand() * SIDE_M, z: -8 + 4 * rand() }));
  const big: GridSpec = { minX: 0, minY: 0, cellSizeM: SIDE_M / 500, cols: 500, rows: 500 };

  // the same wells in lon/lat (about 5 km square at 46° N) for @turf/interpolate, on a grid of about 100 × 100 points
  const mPerDegLat = 111_195;
  const mPerDegLon = mPerDegLat * Math.cos((46 * Math.PI) / 180);
  const fc = featureCollection(wells.map((w) => point([7 + w.x / mPerDegLon, 46 + w.y / mPerDegLat], { z: w.z })));
  const turfOptions = { gridType: 'point' as const, property: 'z', units: 'kilometers' as const, weight: 2 };
  const turfCells = interpolate(fc, SIDE_M / 1000 / 100, turfOptions).features.length;

  let sink = 0;
  const turfMs = medianMs(1, () => {
    sink += interpolate(fc, SIDE_M / 1000 / 100, turfOptions).features.length;
  });
  const allMs = medianMs(3, () => {
    sink += idwGrid(wells, big)[0];
  });
  const knnMs = medianMs(3, () => {
    sink += idwGrid(wells, big, { neighbours: 12 })[0];
  });

  const nsPerPair = (ms: number, cells: number) => (ms * 1e6) / (cells * WELLS);
  const turfNs = nsPerPair(turfMs, turfCells);
  const allNs = nsPerPair(allMs, big.cols * big.rows);
  const ratio = turfNs / allNs;
  const fmt = (ms: number) => `${ms.toFixed(0).padStart(7)} ms`;
  console.log(`IDW, ${WELLS} random wells on ${SIDE_M / 1000} km square, power 2; median of 3 runs after a warm-up (turf: 1 run)`);
  console.log(`  @turf/interpolate, ${turfCells} points (baseline)   ${fmt(turfMs)}   ${turfNs.toFixed(1).padStart(6)} ns per cell-well pair`);
  console.log(`  idwGrid, all wells, 500 × 500                  ${fmt(allMs)}   ${allNs.toFixed(2).padStart(6)} ns per cell-well pair   ${ratio.toFixed(0)}× faster per pair than the baseline`);
  console.log(`  idwGrid, 12 nearest, 500 × 500                 ${fmt(knnMs)}`);
  console.log(`  targets: ≥ ${TARGET_RATIO}× the baseline per pair: ${ratio >= TARGET_RATIO ? 'met' : 'NOT met'}; 12 nearest < ${TARGET_KNN_MS} ms: ${knnMs < TARGET_KNN_MS ? 'met' : 'NOT met'}`);
  console.log(`  (turf per pair = its time / (points × wells), extrapolated to 500 × 500 it would take ≈ ${((turfNs * 250_000 * WELLS) / 1e9).toFixed(0)} s)`);
  if (sink === 0.5) console.log('');
}
