import type { DataSource } from 'typeorm';
import { dampingParameterFromK, modelHead, timeScaleSeconds } from '../../shared/hydraulics/high-k';
import { hvorslevT0Seconds } from '../../shared/hydraulics/hvorslev';
import { reduceRecord } from '../../shared/hydraulics/reduction';
import { RecordEntity } from '../../server/features/records/record.entity';
import { RecordSeries } from '../../server/features/records/record-series.entity';
import { Well } from '../../server/features/wells/well.entity';
import { wellGeometry } from '../../server/features/fits/fits.service';

const blob = (a: Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

/**
 * A rising-head record made from the Hvorslev model for a chosen K, stored as the records feature
 * stores one (reduced series as Float64 BLOBs). Depth below the measuring point, 1 s sampling.
 * With `highK`, the response is the high-K (Springer-Gelhar) model instead: C_D from K and L_e
 * through the Hvorslev shape factor (`dampingParameterFromK`), sampled at √(L_e/g)/25.
 */
export async function insertSyntheticRecord(
  ds: DataSource,
  wellId: string,
  o: { kMetersPerSecond: number; h0M?: number; staticDepthM?: number; oscillate?: boolean; highK?: { effectiveLengthM: number } },
): Promise<{ recordId: string; t0Seconds: number; dampingParameter?: number }> {
  const well = await ds.getRepository(Well).findOneByOrFail({ id: wellId });
  const t0 = hvorslevT0Seconds(wellGeometry(well), o.kMetersPerSecond);
  const h0 = o.h0M ?? 0.8;
  const staticDepth = o.staticDepthM ?? 4.2;
  const highK = o.highK
    ? { effectiveLengthM: o.highK.effectiveLengthM, dampingParameter: dampingParameterFromK('hvorslev', wellGeometry(well), o.kMetersPerSecond, o.highK.effectiveLengthM) }
    : null;
  const scale = highK ? timeScaleSeconds(highK.effectiveLengthM) : 0;
  // High-K: until the slower of the envelope e^(−C_D t_d/2) and the overdamped e^(−t/(C_D √(L_e/g))) is below 1e−3.
  const highKSpan = highK ? 7 * scale * Math.max(2 / highK.dampingParameter, highK.dampingParameter) : 0;
  const dt = highK ? scale / 25 : Math.max(0.05, t0 / 40);
  const n = 5 + Math.ceil((highK ? highKSpan : 6 * t0) / dt);
  const time = new Float64Array(n);
  const depth = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = (i - 5) * dt;
    time[i] = i * dt;
    // Bail-down: the level drops by h0 at the start and recovers toward static.
    const s = t < 0 ? 0 : highK ? h0 * modelHead(highK, t) : o.oscillate ? h0 * Math.exp(-t / (3 * t0)) * Math.cos((2 * Math.PI * t) / t0) : h0 * Math.exp(-t / t0);
    depth[i] = staticDepth + s;
  }
  const reduced = reduceRecord({ timeSeconds: time, value: depth }, { reference: 'depth', staticLevelM: staticDepth, testStartSeconds: 5 * dt });
  const repo = ds.getRepository(RecordEntity);
  const rec = await repo.save(
    repo.create({
      siteId: well.siteId,
      wellId,
      testType: 'bail-down',
      source: 'tape',
      reference: 'depth',
      settings: { synthetic: true, kMetersPerSecond: o.kMetersPerSecond },
      testDate: '2026-11-20',
      clock: 'elapsed',
      firstReadingSeconds: 0,
      testStartSeconds: reduced.testStartSeconds,
      testStartIndex: reduced.testStartIndex,
      testStartSource: reduced.testStartSource,
      durationSeconds: time[n - 1],
      fieldCrew: 'test',
      notes: 'Synthetic record for tests (invented)',
      sampleCount: n,
      h0M: reduced.h0M,
      staticLevelM: reduced.staticLevelM,
      staticSource: reduced.staticSource,
      preTestCount: reduced.preTestCount,
      direction: reduced.testType,
      slugVolumeM3: null,
      createdById: null,
      isDemo: false,
    }),
  );
  await ds.getRepository(RecordSeries).insert({
    recordId: rec.id,
    count: n,
    elapsedSeconds: blob(reduced.elapsedSeconds),
    displacementM: blob(reduced.displacementM),
    normalizedHead: blob(reduced.normalizedHead),
  });
  return { recordId: rec.id, t0Seconds: t0, ...(highK ? { dampingParameter: highK.dampingParameter } : {}) };
}
