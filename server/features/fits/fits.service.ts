import { In, IsNull, Not, type EntityManager } from 'typeorm';
import type { z } from 'zod';
import { analyzeReduced, type FitResult } from '@shared/hydraulics/analyze';
import { analyzeHighKReduced, highKResultFields, type HighKAnalysis } from '@shared/hydraulics/analyze-high-k';
import { EngineInputError, OscillatingResponseError } from '@shared/hydraulics/errors';
import { answeredByFit, flagAction, flagKind, unansweredFlags, type FitChoices } from '@shared/hydraulics/flag-answers';
import type { QcFlag } from '@shared/hydraulics/flags';
import type { WellGeometry } from '@shared/hydraulics/geometry';
import type { ReducedRecord } from '@shared/hydraulics/reduction';
import { wellK } from '@shared/hydraulics/well-k';
import { REFERENCES } from '@shared/hydraulics/references';
import type { SiteRole } from '@shared/schemas/common';
import {
  FIT_STATUS_LABELS,
  type Fit,
  type FitEvent,
  type FitGeometry,
  type WellKDto,
  type fitBodySchema,
  type fitPatchSchema,
} from '@shared/schemas/fits';
import type { AppContext } from '../../context';
import { AppError, badRequest, forbidden, notFound } from '../../lib/errors';
import { RecordEntity } from '../records/record.entity';
import { RecordSeries } from '../records/record-series.entity';
import { Membership } from '../sites/membership.entity';
import { Site } from '../sites/site.entity';
import { User } from '../users/user.entity';
import { Well } from '../wells/well.entity';
import { FitEventEntity } from './fit-event.entity';
import { FitEntity, type ResolvedFlag, type StoredFitResult } from './fit.entity';
import { checkedMail, sentBackMail, awaitingCheckMail } from './fits.mail';

type FitBody = z.output<typeof fitBodySchema>;
type FitPatch = z.output<typeof fitPatchSchema>;
export interface Actor {
  user: Express.User;
  role: SiteRole | null;
}

const PREPARERS: SiteRole[] = ['Lead', 'Analyst'];
const CHECKERS: SiteRole[] = ['Lead', 'Checker'];
const EDITABLE = new Set(['draft', 'sent-back']);

/** A little-endian Float64 BLOB as a Float64Array (copied: the Buffer may not be 8-byte aligned). */
export function float64(buf: Buffer): Float64Array {
  const out = new Float64Array(buf.byteLength / 8);
  new Uint8Array(out.buffer).set(buf);
  return out;
}

export async function loadReduced(m: EntityManager, record: RecordEntity): Promise<ReducedRecord> {
  const series = await m.getRepository(RecordSeries).findOne({ where: { recordId: record.id } });
  if (!series) throw notFound('The reduced series of the record');
  return {
    reference: record.reference,
    testType: record.direction,
    staticLevelM: record.staticLevelM,
    staticSource: record.staticSource,
    preTestCount: record.preTestCount,
    testStartSeconds: record.testStartSeconds,
    testStartIndex: record.testStartIndex,
    testStartSource: record.testStartSource,
    h0M: record.h0M,
    elapsedSeconds: float64(series.elapsedSeconds),
    displacementM: float64(series.displacementM),
    normalizedHead: float64(series.normalizedHead),
  };
}

/** The geometry a new fit starts from: the well's construction, in metres. */
export function wellGeometry(well: Well): FitGeometry {
  const screenLengthM = well.screenBottomDepthM - well.screenTopDepthM;
  // With the static level inside the screen only the saturated part is the intake (Le = Lw).
  const lw = well.staticToScreenBottomM;
  return {
    casingRadiusM: well.casingRadiusM,
    screenRadiusM: well.screenRadiusM,
    boreholeRadiusM: well.boreholeRadiusM,
    screenLengthM: lw && lw < screenLengthM ? lw : screenLengthM,
    // The well says which radius is the intake (decision 012); a fit may override it.
    intake: well.intakeRadius ?? 'screen',
    anisotropyRatio: 1,
    ...(well.staticToScreenBottomM ? { staticToScreenBottomM: well.staticToScreenBottomM } : {}),
    ...(well.saturatedThicknessM ? { saturatedThicknessM: well.saturatedThicknessM } : {}),
  };
}

/** For the audit trail: a fit whose intake is not the well's says so (intake and the well's). */
export function intakeOverride(geometry: FitGeometry, well: Pick<Well, 'intakeRadius'>): { intake?: FitGeometry['intake']; wellIntake?: FitGeometry['intake'] } {
  return geometry.intake !== well.intakeRadius ? { intake: geometry.intake, wellIntake: well.intakeRadius } : {};
}

function engineGeometry(g: FitGeometry): WellGeometry {
  return { ...g };
}

type ComputeBody = Pick<FitBody, 'method' | 'model' | 'line' | 'window' | 'options'>;
type Computed = { kind: 'line'; result: FitResult } | { kind: 'high-k'; result: HighKAnalysis };

/** Run the engine (the straight line or the high-K model); its typed errors become 400s naming the field. */
function compute(reduced: ReducedRecord, body: ComputeBody, geometry: FitGeometry, slugVolumeM3: number | null): Computed {
  try {
    if (body.model === 'high-k') {
      return {
        kind: 'high-k',
        result: analyzeHighKReduced(reduced, {
          variant: body.method,
          geometry: engineGeometry(geometry),
          effectiveLengthM: body.options.highK?.effectiveLengthM,
          fitEffectiveLength: body.options.highK?.fitEffectiveLength ?? true,
          material: body.options.material as never,
          ...(slugVolumeM3 !== null ? { slugVolumeM3 } : {}),
        }),
      };
    }
    return {
      kind: 'line',
      result: analyzeReduced(reduced, {
        method: body.method,
        line: body.line,
        window: body.window,
        geometry: engineGeometry(geometry),
        allowOscillation: body.options.allowOscillation,
        material: body.options.material as never,
        slugVolumeM3: slugVolumeM3 ?? undefined,
      }),
    };
  } catch (e) {
    if (e instanceof OscillatingResponseError) {
      throw new AppError(
        'OSCILLATING',
        `${e.flag.message} The overdamped methods (Hvorslev, Bouwer-Rice) do not apply: fit it with the high-K model instead (model "high-k"), or fit the straight line anyway only with the explicit override.`,
        400,
        {
          model: 'The record oscillates: fit it with the high-K model instead',
          'options.allowOscillation': 'The record oscillates: tick "fit anyway" to fit the straight line regardless',
        },
      );
    }
    if (e instanceof EngineInputError) {
      const field = e.field.startsWith('fit.') ? e.field.slice(4) : e.field;
      throw badRequest(`${field}: ${e.problem}`, { [field]: e.problem });
    }
    throw e;
  }
}

function toStored(c: Computed, reduced: ReducedRecord, slugVolumeM3: number | null): StoredFitResult {
  return c.kind === 'high-k' ? highKResultFields(c.result.fit, reduced, slugVolumeM3) : toStoredResult(c.result, reduced, slugVolumeM3);
}

function toStoredResult(r: FitResult, reduced: ReducedRecord, slugVolumeM3: number | null): StoredFitResult {
  const k = r.k;
  const expectedH0 = slugVolumeM3 && k.casingRadiusM ? slugVolumeM3 / (Math.PI * k.casingRadiusM ** 2) : null;
  return {
    slopePerSecond: r.fit.slopePerSecond,
    intercept: r.fit.intercept,
    t0Seconds: r.fit.t0Seconds,
    rSquared: r.fit.rSquared,
    count: r.fit.count,
    window: {
      source: r.fit.window.source,
      fromSeconds: r.fit.window.fromSeconds,
      toSeconds: r.fit.window.toSeconds,
      headMax: r.fit.window.headMax,
      headMin: r.fit.window.headMin,
      count: r.fit.window.count,
    },
    h0M: reduced.h0M,
    effectiveH0M: r.fit.effectiveH0M,
    expectedH0M: expectedH0,
    lineCrossingSeconds: r.fit.lineCrossingSeconds,
    recordCrossingSeconds: r.fit.recordCrossingSeconds,
    kMetersPerSecond: k.kMetersPerSecond,
    kSimplifiedMetersPerSecond: k.method === 'hvorslev' ? k.simplified.kMetersPerSecond : null,
    casingRadiusUsedM: k.casingRadiusM,
    casingRadiusIsEffective: k.casingRadiusIsEffective,
    lineReference: r.fit.reference,
    kReference: k.reference,
  };
}

/** The lifecycle fields of a fit that starts as a Draft: a new fit, or a new revision of a Checked one. */
function newDraft(result: StoredFitResult, flags: unknown[], preparedById: string, now: Date) {
  return {
    status: 'draft' as const,
    supersededAt: null,
    result,
    flags,
    // A new draft answers its own flags: reasons and resolutions are not carried over from a revised fit.
    flagReasons: {},
    resolvedFlags: [],
    kMetersPerSecond: result.kMetersPerSecond,
    preparedById,
    checkedById: null,
    checkComment: null,
    submittedAt: null,
    checkedAt: null,
    createdAt: now,
    updatedAt: now,
  };
}

/** Field → { from, to } for what a change touched, for the audit trail. */
function diff(before: Record<string, unknown>, after: Record<string, unknown>): Record<string, { from: unknown; to: unknown }> {
  const out: Record<string, { from: unknown; to: unknown }> = {};
  for (const key of new Set([...Object.keys(before), ...Object.keys(after)])) {
    const a = JSON.stringify(before[key] ?? null);
    const b = JSON.stringify(after[key] ?? null);
    if (a !== b) out[key] = { from: before[key] ?? null, to: after[key] ?? null };
  }
  return out;
}

const paramsOf = (f: Pick<FitEntity, 'method' | 'model' | 'line' | 'windowInput' | 'geometry' | 'options' | 'note'>) => ({
  method: f.method,
  model: f.model,
  line: f.line,
  window: f.windowInput,
  ...Object.fromEntries(Object.entries(f.geometry).map(([k, v]) => [`geometry.${k}`, v])),
  allowOscillation: f.options.allowOscillation,
  material: f.options.material ?? null,
  'highK.effectiveLengthM': f.options.highK?.effectiveLengthM ?? null,
  'highK.fitEffectiveLength': f.options.highK ? f.options.highK.fitEffectiveLength : null,
  note: f.note,
});

/** What the flag rules read of a stored fit. */
function choicesOf(f: Pick<FitEntity, 'method' | 'model' | 'line' | 'result'>): FitChoices {
  return { method: f.method, model: f.model, line: f.line, window: { headMax: f.result.window.headMax, headMin: f.result.window.headMin } };
}

/**
 * The record of a flag resolved by its suggested action: when the fit had the flag open and, after
 * the change, the flag is gone or answered by the fit. Otherwise nothing is recorded.
 */
function resolvedBy(code: string, before: FitEntity, after: Pick<FitEntity, 'method' | 'model' | 'line' | 'result' | 'flags'>, byId: string, now: Date): ResolvedFlag | null {
  const had = (before.flags as QcFlag[]).find((f) => f.code === code);
  if (!had || flagKind(code) !== 'changes-k' || answeredByFit(had, choicesOf(before))) return null;
  const still = (after.flags as QcFlag[]).find((f) => f.code === code);
  if (still && !answeredByFit(still, choicesOf(after))) return null;
  return { code, message: had.message, action: flagAction(had, before.method, before.model)?.label ?? 'Changed the fit', byId, at: now.toISOString() };
}

export function createFitsService({ ds, config, outbox }: AppContext) {
  const link = (siteId: string, fitId: string) => `${config.PUBLIC_URL.replace(/\/$/, '')}/sites/${siteId}/fits/${fitId}`;

  async function event(m: EntityManager, fitId: string, kind: FitEvent['kind'], actorId: string | null, details: Record<string, unknown> = {}) {
    await m.getRepository(FitEventEntity).insert({ fitId, kind, actorId, details: details as never, at: new Date() });
  }

  function can(fit: FitEntity, actor: Actor) {
    const isAdmin = actor.user.isAdmin;
    const prepares = isAdmin || PREPARERS.includes(actor.role as SiteRole);
    const checks = isAdmin || CHECKERS.includes(actor.role as SiteRole);
    const isPreparer = fit.preparedById === actor.user.id;
    return {
      edit: EDITABLE.has(fit.status) && prepares && isPreparer,
      revise: fit.status === 'checked' && !fit.supersededAt && prepares,
      submit: EDITABLE.has(fit.status) && prepares && isPreparer,
      check: fit.status === 'awaiting-check' && checks && !isPreparer,
    };
  }

  async function toDto(fit: FitEntity, actor: Actor): Promise<Fit> {
    const [prep, checker, well] = await Promise.all([
      ds.getRepository(User).findOne({ where: { id: fit.preparedById } }),
      fit.checkedById ? ds.getRepository(User).findOne({ where: { id: fit.checkedById } }) : null,
      ds.getRepository(Well).findOne({ where: { id: fit.wellId } }),
    ]);
    return {
      id: fit.id,
      siteId: fit.siteId,
      wellId: fit.wellId,
      wellName: well?.name ?? '',
      recordId: fit.recordId,
      chainId: fit.chainId,
      revision: fit.revision,
      status: fit.status,
      supersededAt: fit.supersededAt?.toISOString() ?? null,
      method: fit.method,
      model: fit.model ?? 'line',
      line: fit.line,
      windowInput: fit.windowInput,
      geometry: fit.geometry,
      options: fit.options,
      note: fit.note,
      result: fit.result,
      flags: fit.flags as Fit['flags'],
      flagReasons: fit.flagReasons ?? {},
      resolvedFlags: await resolvedFlagsDto(fit),
      preparedBy: { id: fit.preparedById, name: prep?.name ?? '(removed account)' },
      checkedBy: fit.checkedById ? { id: fit.checkedById, name: checker?.name ?? '(removed account)' } : null,
      checkComment: fit.checkComment,
      submittedAt: fit.submittedAt?.toISOString() ?? null,
      checkedAt: fit.checkedAt?.toISOString() ?? null,
      createdAt: fit.createdAt.toISOString(),
      updatedAt: fit.updatedAt.toISOString(),
      can: can(fit, actor),
    };
  }

  async function resolvedFlagsDto(fit: FitEntity): Promise<Fit['resolvedFlags']> {
    const list = fit.resolvedFlags ?? [];
    if (list.length === 0) return [];
    const users = await ds.getRepository(User).find({ where: [...new Set(list.map((r) => r.byId))].map((id) => ({ id })), select: { id: true, name: true } });
    const names = new Map(users.map((u) => [u.id, u.name]));
    return list.map((r) => ({ code: r.code, message: r.message, action: r.action, at: r.at, by: { id: r.byId, name: names.get(r.byId) ?? '(removed account)' } }));
  }

  async function getEntity(fitId: string): Promise<FitEntity> {
    const fit = await ds.getRepository(FitEntity).findOne({ where: { id: fitId } });
    if (!fit) throw notFound('The fit');
    return fit;
  }

  function requirePreparer(actor: Actor) {
    if (!actor.user.isAdmin && !PREPARERS.includes(actor.role as SiteRole)) {
      throw forbidden('Only Analysts and Leads prepare fits');
    }
  }

  /** Compute a fit on the server from a record and settings, merged over the well's geometry. */
  async function computeFor(m: EntityManager, recordId: string, body: ComputeBody & Pick<FitBody, 'geometry'>, base?: FitGeometry) {
    const record = await m.getRepository(RecordEntity).findOne({ where: { id: recordId } });
    if (!record) throw notFound('The record');
    const well = await m.getRepository(Well).findOneOrFail({ where: { id: record.wellId } });
    const geometry = { ...(base ?? wellGeometry(well)), ...body.geometry } as FitGeometry;
    const reduced = await loadReduced(m, record);
    const computed = compute(reduced, body, geometry, record.slugVolumeM3);
    return { record, well, geometry, result: toStored(computed, reduced, record.slugVolumeM3), flags: computed.result.flags };
  }

  async function create(recordId: string, actor: Actor, body: FitBody): Promise<Fit> {
    requirePreparer(actor);
    const fit = await ds.transaction(async (m) => {
      const { record, well, geometry, result, flags } = await computeFor(m, recordId, body);
      const now = new Date();
      const repo = m.getRepository(FitEntity);
      const f = repo.create({
        siteId: record.siteId,
        wellId: record.wellId,
        recordId,
        chainId: '',
        revision: 1,
        method: body.method,
        model: body.model,
        line: body.line,
        windowInput: body.window ?? null,
        geometry,
        options: body.options,
        note: body.note,
        ...newDraft(result, flags, actor.user.id, now),
      });
      await repo.save(f);
      f.chainId = f.id;
      await repo.update({ id: f.id }, { chainId: f.id });
      await event(m, f.id, 'created', actor.user.id, {
        method: body.method,
        ...(body.model === 'high-k' ? { model: body.model, ...(body.options.highK ? { highK: body.options.highK } : {}) } : {}),
        line: body.line,
        kMetersPerSecond: result.kMetersPerSecond,
        ...intakeOverride(geometry, well),
      });
      return f;
    });
    return toDto(fit, actor);
  }

  /**
   * Change a Draft or Sent-back fit in place; a Checked fit is never changed: the change starts a
   * new revision (returned with `created: true`) and the old one stays readable.
   */
  async function update(fitId: string, actor: Actor, patch: FitPatch): Promise<{ fit: Fit; created: boolean }> {
    requirePreparer(actor);
    const out = await ds.transaction(async (m) => {
      const repo = m.getRepository(FitEntity);
      const fit = await repo.findOne({ where: { id: fitId } });
      if (!fit) throw notFound('The fit');
      if (fit.status === 'awaiting-check') {
        throw badRequest('This fit is awaiting check and cannot be changed until the checker decides', { status: 'Awaiting check' }, 'LIFECYCLE');
      }
      if (fit.status === 'checked' && fit.supersededAt) {
        throw badRequest('A later revision of this fit has been checked; revise that one instead', { status: 'Superseded' }, 'LIFECYCLE');
      }
      if (EDITABLE.has(fit.status) && fit.preparedById !== actor.user.id) {
        throw forbidden('Only the person who prepared this fit can change it', 'NOT_PREPARER');
      }
      const merged = {
        method: patch.method ?? fit.method,
        model: patch.model ?? fit.model ?? 'line',
        line: patch.line ?? fit.line,
        window: (patch.window === undefined ? fit.windowInput : patch.window) ?? undefined,
        options: patch.options ?? fit.options,
        geometry: { ...fit.geometry, ...patch.geometry },
        note: patch.note ?? fit.note,
      };
      const { geometry, result, flags } = await computeFor(m, fit.recordId, { ...merged, geometry: merged.geometry as FitGeometry }, fit.geometry);
      const next = { method: merged.method, model: merged.model, line: merged.line, windowInput: merged.window ?? null, geometry, options: merged.options, note: merged.note };
      const changes = diff(paramsOf(fit), paramsOf(next));
      const now = new Date();
      if (fit.status === 'checked') {
        const latest = await repo.findOne({ where: { chainId: fit.chainId }, order: { revision: 'DESC' } });
        if (latest && latest.id !== fit.id && latest.status !== 'checked') {
          throw badRequest(`Revision ${latest.revision} of this fit is already open; continue there`, { revision: 'Another revision is open' }, 'LIFECYCLE');
        }
        const rev = repo.create({
          ...fit,
          id: undefined,
          ...next,
          revision: (latest?.revision ?? fit.revision) + 1,
          ...newDraft(result, flags, actor.user.id, now),
        });
        await repo.save(rev);
        await event(m, rev.id, 'revision-started', actor.user.id, { fromFitId: fit.id, fromRevision: fit.revision, changes });
        return { fit: rev, created: true };
      }
      const resolved = patch.resolving ? resolvedBy(patch.resolving, fit, { ...next, result, flags }, actor.user.id, now) : null;
      Object.assign(fit, next, { result, flags, kMetersPerSecond: result.kMetersPerSecond, updatedAt: now });
      if (resolved) fit.resolvedFlags = [...(fit.resolvedFlags ?? []).filter((r) => r.code !== resolved.code), resolved];
      await repo.save(fit);
      await event(m, fit.id, 'parameters-changed', actor.user.id, { changes, kMetersPerSecond: result.kMetersPerSecond, ...(resolved ? { resolved: resolved.code } : {}) });
      return { fit, created: false };
    });
    return { fit: await toDto(out.fit, actor), created: out.created };
  }

  async function siteMembersWithRole(siteId: string, roles: SiteRole[]): Promise<User[]> {
    const ms = await ds.getRepository(Membership).find({ where: { siteId, role: In(roles) }, relations: { user: true } });
    return ms.map((x) => x.user).filter((u) => !u.disabled);
  }

  async function submit(fitId: string, actor: Actor, reasons: Record<string, string> = {}): Promise<Fit> {
    requirePreparer(actor);
    const fit = await ds.transaction(async (m) => {
      const repo = m.getRepository(FitEntity);
      const f = await repo.findOne({ where: { id: fitId } });
      if (!f) throw notFound('The fit');
      if (!EDITABLE.has(f.status)) {
        throw badRequest(`A fit that is ${FIT_STATUS_LABELS[f.status]} cannot be submitted; only a Draft or a Sent-back fit can`, { status: FIT_STATUS_LABELS[f.status] }, 'LIFECYCLE');
      }
      if (f.preparedById !== actor.user.id) throw forbidden('Only the person who prepared this fit can submit it', 'NOT_PREPARER');
      // Flags that change K are answered first: by the fit (the suggested action applied) or by a reason.
      const given = Object.fromEntries(Object.entries({ ...f.flagReasons, ...reasons }).filter(([, r]) => r.trim() !== ''));
      const flags = f.flags as QcFlag[];
      const open = unansweredFlags(flags, choicesOf(f), given);
      if (open.length > 0) {
        const fields = Object.fromEntries(open.map((code) => [`reasons.${code}`, 'Apply the suggested action, or say why this fit stands as it is']));
        throw badRequest(
          `${open.length === 1 ? 'A flag changes' : `${open.length} flags change`} K and ${open.length === 1 ? 'is' : 'are'} not answered: apply the suggested action, or give a reason for the Checker`,
          fields,
          'FLAGS_UNANSWERED',
        );
      }
      const kept = Object.fromEntries(Object.entries(given).filter(([code]) => flags.some((fl) => fl.code === code)));
      const now = new Date();
      const res = await repo.update({ id: f.id, status: f.status }, { status: 'awaiting-check', submittedAt: now, updatedAt: now, flagReasons: kept });
      if (!res.affected) throw badRequest('The fit changed meanwhile; reload it', undefined, 'LIFECYCLE');
      await event(m, f.id, 'submitted', actor.user.id, { from: f.status, ...(Object.keys(kept).length ? { reasons: kept } : {}) });
      Object.assign(f, { status: 'awaiting-check', submittedAt: now, updatedAt: now, flagReasons: kept });
      const checkers = (await siteMembersWithRole(f.siteId, ['Checker'])).filter((u) => u.id !== actor.user.id);
      const [site, well] = await Promise.all([
        m.getRepository(Site).findOneOrFail({ where: { id: f.siteId } }),
        m.getRepository(Well).findOneOrFail({ where: { id: f.wellId } }),
      ]);
      if (checkers.length) {
        await outbox.queue(m, {
          kind: 'fit-submitted',
          to: checkers.map((u) => u.email),
          ...awaitingCheckMail({ siteName: site.name, wellName: well.name, preparer: actor.user.name, kMetersPerSecond: f.kMetersPerSecond, revision: f.revision, link: link(f.siteId, f.id) }),
        });
      }
      return f;
    });
    return toDto(fit, actor);
  }

  async function check(fitId: string, actor: Actor, decision: 'checked' | 'sent-back', comment: string): Promise<Fit> {
    if (!actor.user.isAdmin && !CHECKERS.includes(actor.role as SiteRole)) throw forbidden('Only Checkers and Leads check fits');
    const fit = await ds.transaction(async (m) => {
      const repo = m.getRepository(FitEntity);
      const f = await repo.findOne({ where: { id: fitId } });
      if (!f) throw notFound('The fit');
      if (f.preparedById === actor.user.id) {
        throw forbidden('You prepared this fit, so someone else must check it (separation of duties)', 'SELF_CHECK');
      }
      if (f.status !== 'awaiting-check') {
        throw badRequest(`Only a fit awaiting check can be checked or sent back; this one is ${FIT_STATUS_LABELS[f.status]}`, { status: FIT_STATUS_LABELS[f.status] }, 'LIFECYCLE');
      }
      const now = new Date();
      const patch = { status: decision, checkedById: actor.user.id, checkComment: comment || null, checkedAt: now, updatedAt: now } as const;
      const res = await repo.update({ id: f.id, status: 'awaiting-check' }, patch);
      if (!res.affected) throw badRequest('The fit changed meanwhile; reload it', undefined, 'LIFECYCLE');
      await event(m, f.id, decision, actor.user.id, comment ? { comment } : {});
      if (decision === 'checked') {
        // Earlier Checked revisions of the chain stop counting toward Well K; they stay readable.
        const older = await repo.find({ where: { chainId: f.chainId, status: 'checked', supersededAt: IsNull(), id: Not(f.id) } });
        for (const o of older) {
          await repo.update({ id: o.id }, { supersededAt: now });
          await event(m, o.id, 'superseded', actor.user.id, { byFitId: f.id, byRevision: f.revision });
        }
      }
      Object.assign(f, patch);
      const [preparer, site, well] = await Promise.all([
        m.getRepository(User).findOne({ where: { id: f.preparedById } }),
        m.getRepository(Site).findOneOrFail({ where: { id: f.siteId } }),
        m.getRepository(Well).findOneOrFail({ where: { id: f.wellId } }),
      ]);
      if (preparer && !preparer.disabled) {
        const o = { siteName: site.name, wellName: well.name, checker: actor.user.name, kMetersPerSecond: f.kMetersPerSecond, revision: f.revision, comment, link: link(f.siteId, f.id) };
        await outbox.queue(m, { kind: decision === 'checked' ? 'fit-checked' : 'fit-sent-back', to: preparer.email, ...(decision === 'checked' ? checkedMail(o) : sentBackMail(o)) });
      }
      return f;
    });
    return toDto(fit, actor);
  }

  async function get(fitId: string, actor: Actor): Promise<Fit> {
    return toDto(await getEntity(fitId), actor);
  }

  async function listForRecord(recordId: string, actor: Actor): Promise<Fit[]> {
    const fits = await ds.getRepository(FitEntity).find({ where: { recordId }, order: { createdAt: 'ASC', revision: 'ASC' } });
    return Promise.all(fits.map((f) => toDto(f, actor)));
  }

  async function listForWell(wellId: string, actor: Actor): Promise<Fit[]> {
    const fits = await ds.getRepository(FitEntity).find({ where: { wellId }, order: { createdAt: 'ASC', revision: 'ASC' } });
    return Promise.all(fits.map((f) => toDto(f, actor)));
  }

  async function revisions(fitId: string, actor: Actor): Promise<Fit[]> {
    const fit = await getEntity(fitId);
    const fits = await ds.getRepository(FitEntity).find({ where: { chainId: fit.chainId }, order: { revision: 'ASC' } });
    return Promise.all(fits.map((f) => toDto(f, actor)));
  }

  async function audit(fitId: string): Promise<FitEvent[]> {
    const fit = await getEntity(fitId);
    const events = await ds.getRepository(FitEventEntity).find({ where: { fitId: fit.id }, relations: { actor: true }, order: { at: 'ASC' } });
    return events.map((e) => ({
      id: e.id,
      fitId: e.fitId,
      kind: e.kind,
      actor: e.actor ? { id: e.actor.id, name: e.actor.name } : null,
      at: e.at.toISOString(),
      details: e.details,
    }));
  }

  /** Well K: the geometric mean of the well's Checked fits that no later revision replaced. */
  async function wellKFor(wellId: string): Promise<WellKDto> {
    const fits = await ds.getRepository(FitEntity).find({ where: { wellId, status: 'checked', supersededAt: IsNull() }, order: { checkedAt: 'ASC' } });
    const base = {
      wellId,
      fits: fits.map((f) => ({ fitId: f.id, recordId: f.recordId, method: f.method, kMetersPerSecond: f.kMetersPerSecond, checkedAt: (f.checkedAt ?? f.updatedAt).toISOString() })),
    };
    if (!fits.length) return { ...base, kMetersPerSecond: null, count: 0, log10Mean: null, log10StdDev: null, reference: REFERENCES.wellK };
    const w = wellK(fits.map((f) => f.kMetersPerSecond));
    return { ...base, kMetersPerSecond: w.kMetersPerSecond, count: w.count, log10Mean: w.log10Mean, log10StdDev: w.log10StdDev, reference: w.reference };
  }

  /** The fits awaiting my check across my sites (Checker or Lead there, or Admin), oldest first; never my own. */
  async function queue(user: Express.User) {
    const memberships = await ds.getRepository(Membership).find({ where: { userId: user.id } });
    const siteIds = user.isAdmin
      ? (await ds.getRepository(Site).find({ select: { id: true } })).map((s) => s.id)
      : memberships.filter((x) => CHECKERS.includes(x.role)).map((x) => x.siteId);
    if (!siteIds.length) return [];
    const fits = await ds.getRepository(FitEntity).find({
      where: { siteId: In(siteIds), status: 'awaiting-check', preparedById: Not(user.id) },
      order: { submittedAt: 'ASC' },
    });
    const sites = new Map((await ds.getRepository(Site).find({ where: { id: In(siteIds) } })).map((s) => [s.id, s.name]));
    const wells = new Map((await ds.getRepository(Well).find({ where: { id: In([...new Set(fits.map((f) => f.wellId))]) } })).map((w) => [w.id, w.name]));
    const people = new Map((await ds.getRepository(User).find({ where: { id: In([...new Set(fits.map((f) => f.preparedById))]) } })).map((u) => [u.id, u.name]));
    return fits.map((f) => ({
      fitId: f.id,
      siteId: f.siteId,
      siteName: sites.get(f.siteId) ?? '',
      wellId: f.wellId,
      wellName: wells.get(f.wellId) ?? '',
      recordId: f.recordId,
      method: f.method,
      kMetersPerSecond: f.kMetersPerSecond,
      revision: f.revision,
      preparedBy: { id: f.preparedById, name: people.get(f.preparedById) ?? '' },
      submittedAt: (f.submittedAt ?? f.updatedAt).toISOString(),
      flagCount: (f.flags as unknown[]).length,
    }));
  }

  /** What the workspace needs to run the engine in the browser: the reduced record, decimated if long. */
  async function reducedFor(recordId: string, maxPoints: number) {
    const record = await ds.getRepository(RecordEntity).findOne({ where: { id: recordId } });
    if (!record) throw notFound('The record');
    const well = await ds.getRepository(Well).findOneOrFail({ where: { id: record.wellId } });
    const r = await loadReduced(ds.manager, record);
    const n = r.elapsedSeconds.length;
    // Keep every reading up to maxPoints; beyond that a uniform stride from the test start on,
    // which keeps sign changes (oscillation) visible to the preview's QC.
    const stride = n > maxPoints ? Math.ceil(n / maxPoints) : 1;
    const idx: number[] = [];
    for (let i = 0; i < r.testStartIndex; i += stride) idx.push(i);
    for (let i = r.testStartIndex; i < n; i += stride) idx.push(i);
    if (idx[idx.length - 1] !== n - 1) idx.push(n - 1);
    const pick = (a: Float64Array) => idx.map((i) => a[i]);
    return {
      recordId,
      wellId: record.wellId,
      siteId: record.siteId,
      reference: r.reference,
      testType: r.testType,
      staticLevelM: r.staticLevelM,
      staticSource: r.staticSource,
      preTestCount: r.preTestCount,
      testStartSeconds: r.testStartSeconds,
      testStartIndex: idx.findIndex((i) => i >= r.testStartIndex),
      testStartSource: r.testStartSource,
      h0M: r.h0M,
      readings: n,
      decimated: stride > 1,
      elapsedSeconds: pick(r.elapsedSeconds),
      displacementM: pick(r.displacementM),
      normalizedHead: pick(r.normalizedHead),
      slugVolumeM3: record.slugVolumeM3,
      defaultGeometry: wellGeometry(well),
      hydroUnit: well.hydroUnit,
    };
  }

  return { create, update, submit, check, get, listForRecord, listForWell, revisions, audit, wellKFor, queue, reducedFor };
}
export type FitsService = ReturnType<typeof createFitsService>;
