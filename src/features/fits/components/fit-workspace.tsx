import { useMemo, useState, type ReactNode } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useNavigate } from 'react-router-dom';
import type { FitSettings } from '@shared/hydraulics/analyze';
import { FIT_LINES, FIT_METHODS, type FitLine, type FitMethod, type FitWindow } from '@shared/hydraulics/fitting';
import { MATERIALS, type MaterialId } from '@shared/hydraulics/materials';
import { LATE_SEGMENT } from '@shared/hydraulics/qc';
import type { Fit, FitBody, FitModel } from '@shared/schemas/fits';
import type { HighKSettings } from '@shared/hydraulics/analyze-high-k';
import { estimateEffectiveLength } from '@shared/hydraulics/high-k';
import type { Series } from '@shared/schemas/records';
import type { Site } from '@shared/schemas/sites';
import { isKUnit, type KUnit } from '@shared/units/conductivity';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { CheckboxField, SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { useToast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { useMediaQuery } from '@/lib/use-media-query';
import { useSessionState } from '@/lib/use-session-state';
import { createFit, fitKeys, invalidateFit, updateFit, type ReducedDto } from '../api';
import { defaultKUnit } from '../format';
import {
  displayValue,
  draftFromGeometry,
  effectiveLengthFromDraft,
  geometryFieldOf,
  geometryFromDraft,
  geometryUnitsFor,
  type GeometryDraft,
  type GeometryErrors,
} from '../geometry-form';
import { defaultTimeUnit, PLOT_TIME_UNITS, recoveryEndSeconds, type PlotTimeUnit, type TimeRange } from '../plot-math';
import {
  highKCurveForPlot,
  residuals,
  runHighKPreview,
  runPreview,
  toReducedRecord,
  viewFromHighK,
  viewFromPreview,
  viewFromStored,
  windowFilter,
  type ResultView,
} from '../preview';
import { highKResiduals } from '@shared/hydraulics/analyze-high-k';
import { formatLengthIn } from '../format';
import { Cautions } from './cautions';
import { FitActions, type SubmitAnswers } from './fit-actions';
import { FitPlot } from './fit-plot';
import { FitResults } from './fit-results';
import { GeometryFields } from './geometry-fields';
import { QcFlagList, type FlagAnswering } from './qc-flags';
import { unansweredFlags, type FitChoices, type FlagAction } from '@shared/hydraulics/flag-answers';
import { WindowFields } from './window-fields';

interface Inputs {
  method: FitMethod;
  model: FitModel;
  line: FitLine;
  window: FitWindow | null;
  geometry: GeometryDraft;
  allowOscillation: boolean;
  material: MaterialId | '';
  note: string;
  /** High-K: L_e as typed in the site's length unit (empty: the well's estimate), and whether it is fitted. */
  effectiveLength: string;
  fitEffectiveLength: boolean;
}

function initialInputs(fit: Fit | null, reduced: ReducedDto, site: WorkspaceSite): Inputs {
  const units = geometryUnitsFor(site.displayUnits);
  if (!fit) {
    return {
      method: 'hvorslev',
      model: 'line',
      line: 'anchored',
      window: null,
      geometry: draftFromGeometry(reduced.defaultGeometry, units),
      allowOscillation: false,
      material: '',
      note: '',
      effectiveLength: '',
      fitEffectiveLength: true,
    };
  }
  return {
    method: fit.method,
    line: fit.line,
    window: fit.windowInput,
    geometry: draftFromGeometry(fit.geometry, units),
    allowOscillation: fit.options.allowOscillation,
    material: (MATERIALS.find((m) => m.id === fit.options.material)?.id ?? '') as MaterialId | '',
    note: fit.note,
    model: fit.model,
    effectiveLength: displayValue(fit.options.highK?.effectiveLengthM, units.length),
    fitEffectiveLength: fit.options.highK?.fitEffectiveLength ?? true,
  };
}

/** What the workspace needs of the site: its id and display units. */
type WorkspaceSite = Pick<Site, 'id' | 'displayUnits'>;

const isPlotTimeUnit = (v: string): v is PlotTimeUnit => PLOT_TIME_UNITS.some((u) => u.id === v);

interface SaveErrors {
  geometry: GeometryErrors;
  window?: string;
  effectiveLength?: string;
  message?: string;
}

/** Server `fields` onto the inputs they are about; what is left goes above the Save button. */
function saveErrorsFrom(error: unknown): SaveErrors {
  const out: SaveErrors = { geometry: {} };
  if (!isApiError(error)) return { ...out, message: describeError(error) };
  const rest: string[] = [];
  for (const [path, message] of Object.entries(error.fields ?? {})) {
    const g = geometryFieldOf(path);
    if (g) out.geometry[g] = message;
    else if (path === 'window' || path.startsWith('window.')) out.window = message;
    else if (path.startsWith('options.highK')) out.effectiveLength = message;
    else rest.push(message);
  }
  if (rest.length > 0 || (!out.window && !out.effectiveLength && Object.keys(out.geometry).length === 0)) out.message = rest.length > 0 ? rest.join(' ') : error.message;
  return out;
}

export function FitWorkspace({
  site,
  reduced,
  series,
  fit,
  wellFilterPackPorosity = null,
  aside,
}: {
  site: WorkspaceSite;
  reduced: ReducedDto;
  series: Series;
  fit: Fit | null;
  /** The well's filter-pack porosity, offered when the level moves within the pack. */
  wellFilterPackPorosity?: number | null;
  /** Shown under the plot: the audit trail and revisions of a saved fit. */
  aside?: ReactNode;
}) {
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const toast = useToast();
  const units = useMemo(() => geometryUnitsFor(site.displayUnits), [site.displayUnits]);
  const baseline = useMemo(() => initialInputs(fit, reduced, site), [fit, reduced, site]);
  const [inputs, setInputs] = useState<Inputs>(baseline);
  const [revising, setRevising] = useState(false);
  const [saveErrors, setSaveErrors] = useState<SaveErrors>({ geometry: {} });
  const set = (patch: Partial<Inputs>) => {
    setInputs((current) => ({ ...current, ...patch }));
    setSaveErrors({ geometry: {} });
  };

  const [kUnit, setKUnit] = useSessionState<KUnit>(`kfield.kUnit.${site.id}`, defaultKUnit(site.displayUnits), isKUnit);
  const record = useMemo(() => toReducedRecord(reduced), [reduced]);
  const lastSeconds = reduced.elapsedSeconds.length > 0 ? reduced.elapsedSeconds[reduced.elapsedSeconds.length - 1] : 0;
  // The unit that suits the recovery the plot opens on, not a long tail at static.
  const openingSeconds = recoveryEndSeconds(series.elapsedSeconds, series.normalizedHead) ?? lastSeconds;
  const [timeUnit, setTimeUnit] = useSessionState<PlotTimeUnit>(`kfield.timeUnit.${reduced.recordId}`, defaultTimeUnit(openingSeconds), isPlotTimeUnit);

  const editable = fit === null || fit.can.edit || revising;
  const dirty = JSON.stringify(inputs) !== JSON.stringify(baseline);

  const parsed = useMemo(() => geometryFromDraft(inputs.geometry, units, inputs.method), [inputs.geometry, units, inputs.method]);
  const settings = useMemo<FitSettings | null>(
    () =>
      parsed.geometry
        ? {
            method: inputs.method,
            line: inputs.line,
            geometry: parsed.geometry,
            window: inputs.window ?? undefined,
            allowOscillation: inputs.allowOscillation,
            slugVolumeM3: reduced.slugVolumeM3 ?? undefined,
            material: inputs.material || undefined,
          }
        : null,
    [parsed.geometry, inputs.method, inputs.line, inputs.window, inputs.allowOscillation, inputs.material, reduced.slugVolumeM3],
  );
  const highKModel = inputs.model === 'high-k';
  const effectiveLength = useMemo(() => effectiveLengthFromDraft(inputs.effectiveLength, units.length), [inputs.effectiveLength, units.length]);
  const highKSettings = useMemo<HighKSettings | null>(
    () =>
      parsed.geometry && !effectiveLength.error
        ? {
            variant: inputs.method,
            geometry: parsed.geometry,
            effectiveLengthM: effectiveLength.valueM,
            fitEffectiveLength: inputs.fitEffectiveLength,
            material: inputs.material || undefined,
            slugVolumeM3: reduced.slugVolumeM3 ?? undefined,
          }
        : null,
    [parsed.geometry, effectiveLength, inputs.method, inputs.fitEffectiveLength, inputs.material, reduced.slugVolumeM3],
  );
  // L_e from the well's geometry, for the field's placeholder (null when the well cannot give it).
  const effectiveLengthEstimateM = useMemo(() => {
    if (!parsed.geometry) return null;
    try {
      return estimateEffectiveLength(parsed.geometry).effectiveLengthM;
    } catch {
      return null;
    }
  }, [parsed.geometry]);
  const preview = useMemo(
    () => (highKModel ? (highKSettings ? runHighKPreview(record, highKSettings) : null) : settings ? runPreview(record, settings) : null),
    [highKModel, record, settings, highKSettings],
  );

  const showStored = fit !== null && !dirty;
  const view = useMemo<ResultView | null>(
    () =>
      showStored
        ? viewFromStored(fit)
        : preview?.kind === 'ok'
          ? viewFromPreview(preview.result, record, reduced.slugVolumeM3)
          : preview?.kind === 'high-k'
            ? viewFromHighK(preview.result, record, reduced.slugVolumeM3)
            : null,
    [showStored, fit, preview, record, reduced.slugVolumeM3],
  );

  const engineGeometryErrors: GeometryErrors = {};
  let engineWindowError: string | undefined;
  let engineMessage: string | undefined;
  let engineEffectiveLengthError: string | undefined;
  if (!showStored && preview?.kind === 'input-error') {
    const g = geometryFieldOf(preview.field);
    if (g) engineGeometryErrors[g] = preview.message.replace(/^geometry\.\w+: /, '');
    else if (preview.field.startsWith('options.highK')) engineEffectiveLengthError = preview.message.replace(/^options\.highK\.\w+: /, 'L_e ');
    else if (preview.field.startsWith('fit.window')) engineWindowError = `The window ${preview.message.replace(/^fit\.window[.\w]*: /, '')}`;
    else engineMessage = preview.message;
  }
  const geometryErrors = { ...parsed.errors, ...engineGeometryErrors, ...saveErrors.geometry };
  const windowError = saveErrors.window ?? engineWindowError;
  const effectiveLengthError = effectiveLength.error ?? saveErrors.effectiveLength ?? engineEffectiveLengthError;

  const inWindow = useMemo(() => {
    if (view?.highK) return () => true;
    if (view) return windowFilter(inputs.window, view, inputs.method);
    if (inputs.window?.kind === 'time') {
      const w = inputs.window;
      return (t: number) => t >= w.fromSeconds && t <= w.toSeconds;
    }
    return () => false;
  }, [view, inputs.window, inputs.method]);
  const curveModel = useMemo(
    () =>
      view?.highK
        ? { dampingParameter: view.highK.dampingParameter, effectiveLengthM: view.highK.effectiveLengthM, timeOffsetSeconds: view.highK.timeOffsetSeconds, timeScaleSeconds: view.highK.timeScaleSeconds }
        : null,
    [view],
  );
  // The fitted high-K curve, sampled (400 points) from the stored or previewed C_D, L_e and time offset.
  const modelCurve = useMemo(() => (curveModel ? highKCurveForPlot(curveModel, lastSeconds) : null), [curveModel, lastSeconds]);
  const residualSeries = useMemo(
    () => (curveModel ? highKResiduals(record, curveModel) : view ? residuals(record, view, inWindow) : null),
    [record, view, inWindow, curveModel],
  );
  const band: TimeRange | null = view?.highK
    ? null
    : inputs.window?.kind === 'time'
      ? inputs.window
      : view
        ? { fromSeconds: view.window.fromSeconds, toSeconds: view.window.toSeconds }
        : null;

  const body = (): FitBody | null => {
    if (!parsed.geometry) return null;
    if (highKModel && effectiveLength.error) return null;
    return {
      method: inputs.method,
      model: inputs.model,
      line: inputs.line,
      ...(inputs.window ? { window: inputs.window } : {}),
      geometry: parsed.geometry,
      options: {
        allowOscillation: inputs.allowOscillation,
        ...(inputs.material ? { material: inputs.material } : {}),
        ...(highKModel
          ? { highK: { ...(effectiveLength.valueM !== undefined ? { effectiveLengthM: effectiveLength.valueM } : {}), fitEffectiveLength: inputs.fitEffectiveLength } }
          : {}),
      },
      note: inputs.note,
    };
  };

  const save = useMutation({
    // A change sends `window: null` to return to the method's default window.
    mutationFn: (b: FitBody) => (fit ? updateFit(fit.id, { ...b, window: inputs.window }) : createFit(reduced.recordId, b)),
    onSuccess: async (saved) => {
      queryClient.setQueryData(fitKeys.detail(saved.id), saved);
      await invalidateFit(queryClient, saved, fit?.id);
      if (!fit) toast.success('Fit saved as a Draft.');
      else if (saved.id !== fit.id) toast.success(`Revision ${saved.revision} started; the Checked revision ${fit.revision} stays as it was.`);
      else toast.success('Changes saved.');
      setRevising(false);
      if (!fit || saved.id !== fit.id) navigate(`/sites/${site.id}/fits/${saved.id}`, { replace: !fit });
    },
    onError: (error) => setSaveErrors(saveErrorsFrom(error)),
  });

  const onSave = () => {
    const b = body();
    if (b) save.mutate(b);
  };

  // Flags that change K: answered by their one-click action (on the saved fit) or by a reason, before submit.
  const [reasons, setReasons] = useState<Record<string, string>>(fit?.flagReasons ?? {});
  const [submitErrors, setSubmitErrors] = useState<Record<string, string>>({});
  const apply = useMutation({
    mutationFn: ({ code, action }: { code: string; action: FlagAction }) => updateFit(fit!.id, { ...action.patch, resolving: code }),
    onSuccess: async (saved, { action }) => {
      queryClient.setQueryData(fitKeys.detail(saved.id), saved);
      await invalidateFit(queryClient, saved, fit?.id);
      toast.success(`Applied: ${action.label}.`);
    },
    onError: (error) => toast.error(describeError(error)),
  });
  const choices: FitChoices | null = view ? { method: inputs.method, model: view.model, line: inputs.line, window: view.window } : null;
  const answering: FlagAnswering | null = choices
    ? {
        choices,
        reasons,
        onReasonChange: fit?.can.submit
          ? (code, reason) => {
              setReasons((r) => ({ ...r, [code]: reason }));
              setSubmitErrors((e) => ({ ...e, [`reasons.${code}`]: '' }));
            }
          : null,
        onApply: fit?.can.edit && showStored ? (code, action) => apply.mutate({ code, action }) : null,
        applyingCode: apply.isPending ? apply.variables.code : null,
        applyBlockedReason: fit === null ? 'save the Draft to apply it in one click' : dirty ? 'save or discard your changes first' : undefined,
        errors: submitErrors,
        resolved: fit?.resolvedFlags ?? [],
      }
    : null;
  const unanswered = view && choices ? unansweredFlags(view.flags, choices, reasons).length : 0;

  const concave = view?.flags.some((f) => f.code === 'concave-upward') ?? false;
  const oscillationFlag = !showStored && preview?.kind === 'oscillating' ? preview.flag : null;
  const oscillationOverridden = inputs.allowOscillation && (view?.flags.some((f) => f.code === 'oscillation') ?? false);
  const saveBlocked = !parsed.geometry || (!showStored && preview?.kind !== 'ok' && preview?.kind !== 'high-k');

  const wide = useMediaQuery('(min-width: 1024px)');
  const resultHeading = showStored ? (
    <p className="text-xs text-slate-600">
      Stored result, computed by the server on all {reduced.readings.toLocaleString()} readings.
    </p>
  ) : (
    <p className="text-xs text-slate-600" data-preview-ms={preview?.kind === 'high-k' ? preview.milliseconds.toFixed(1) : undefined}>
      Preview computed in your browser
      {preview?.kind === 'high-k' ? ` (the high-K fit took ${Math.max(1, Math.round(preview.milliseconds))} ms)` : ''}
      {reduced.decimated
        ? ` on ${reduced.elapsedSeconds.length.toLocaleString()} of ${reduced.readings.toLocaleString()} readings; the saved result is computed on all readings.`
        : ` on all ${reduced.readings.toLocaleString()} readings.`}
    </p>
  );

  const plotCard = (
    <Card aria-labelledby="fit-plot-title">
      <CardHeader
        titleId="fit-plot-title"
        title="Normalized head against time"
        description={
          highKModel
            ? `Every reading from the test start on a linear axis, with the fitted high-K model (Springer-Gelhar) and the static level H/H0 = 0.`
            : `${series.plottable.toLocaleString()} readings from the test start (${series.elapsedSeconds.length.toLocaleString()} drawn)${
                series.omitted > 0 ? `; ${series.omitted.toLocaleString()} before the start or at static not drawn on the log axis` : ''
              }.`
        }
      />
      <CardBody>
        {series.elapsedSeconds.length === 0 ? (
          <Alert tone="warning">This record has no readings above static after the test start, so there is nothing to draw on a log axis.</Alert>
        ) : (
          <FitPlot
            elapsedSeconds={series.elapsedSeconds}
            normalizedHead={series.normalizedHead}
            linearSeries={record}
            method={inputs.method}
            window={band}
            onWindowChange={editable && !highKModel ? (range) => set({ window: { kind: 'time', ...range } }) : undefined}
            inWindow={inWindow}
            model={modelCurve}
            line={
              view && !view.highK
                ? {
                    intercept: view.intercept,
                    slopePerSecond: view.slopePerSecond,
                    lineCrossingSeconds: view.lineCrossingSeconds,
                    recordCrossingSeconds: view.recordCrossingSeconds,
                    anchored: inputs.line === 'anchored',
                  }
                : null
            }
            residuals={residualSeries}
            timeUnit={timeUnit}
            onTimeUnitChange={setTimeUnit}
            label={
              view?.highK
                ? `Linear plot of H/H0 against time with the fitted high-K model, C_D ${view.highK.dampingParameter.toPrecision(3)}, ${view.highK.regime}`
                : `Semi-log plot of H/H0 against time${view ? `, T0 ${view.t0Seconds.toPrecision(3)} s` : ''}`
            }
          />
        )}
        {reduced.decimated && !showStored ? (
          <p className="mt-2 text-xs text-slate-600">
            Preview on {reduced.elapsedSeconds.length.toLocaleString()} of {reduced.readings.toLocaleString()} readings; the saved result is computed on all
            readings.
          </p>
        ) : null}
      </CardBody>
    </Card>
  );
  const geometryCard = (
    <Card aria-labelledby="fit-geometry-title">
      <CardHeader
        titleId="fit-geometry-title"
        title="Geometry and material"
        description={fit ? 'As used for this fit.' : 'From the well; changes apply to this fit only.'}
      />
      <CardBody className="space-y-4">
        <GeometryFields
          draft={inputs.geometry}
          onChange={(geometry) => set({ geometry })}
          units={units}
          method={inputs.method}
          errors={geometryErrors}
          readOnly={!editable}
          onReset={() => set({ geometry: draftFromGeometry(reduced.defaultGeometry, units) })}
          wellPorosity={wellFilterPackPorosity}
          wellIntake={reduced.defaultGeometry.intake}
        />
        <div className="grid items-start gap-3 border-t border-slate-200 pt-4 sm:grid-cols-2">
        <SelectField
          label="Material of the screened unit"
          value={inputs.material}
          onChange={(e) => set({ material: e.target.value as MaterialId | '' })}
          disabled={!editable}
          hint={reduced.hydroUnit ? `The well’s unit: ${reduced.hydroUnit}. K is compared with the material’s range.` : 'K is compared with the material’s range.'}
        >
          <option value="">Not stated</option>
          {MATERIALS.map((m) => (
            <option key={m.id} value={m.id}>
              {m.label}
            </option>
          ))}
        </SelectField>
        <TextAreaField
          label="Note"
          value={inputs.note}
          onChange={(e) => set({ note: e.target.value })}
          readOnly={!editable}
          maxLength={2000}
          hint="Kept with the fit; the Checker reads it."
        />
        </div>
      </CardBody>
    </Card>
  );
  const switchToHighK = () => set({ model: 'high-k', allowOscillation: false });
  const methodCard = (
    <Card aria-labelledby="fit-method-title">
      <CardHeader titleId="fit-method-title" title={highKModel ? 'Model and method' : 'Model, method and window'} />
      <CardBody className="space-y-4">
        <SelectField
          label="Model"
          value={inputs.model}
          onChange={(e) => set({ model: e.target.value as FitModel })}
          disabled={!editable}
          hint={
            highKModel
              ? 'Springer & Gelhar (1991) as Butler (1998) gives it: fitted to H/H0 by nonlinear least squares over every reading from the test start.'
              : 'The straight line of ln(H/H0) against time (overdamped response).'
          }
        >
          <option value="line">Straight line</option>
          <option value="high-k">High-K (oscillating or near-critical record)</option>
        </SelectField>
        <div className={highKModel ? '' : 'grid grid-cols-[3fr_2fr] gap-3'}>
          <SelectField
            label={highKModel ? 'Method (shape factor of the high-K variant)' : 'Method'}
            value={inputs.method}
            onChange={(e) => set({ method: e.target.value as FitMethod })}
            disabled={!editable}
          >
            {FIT_METHODS.map((m) => (
              <option key={m.id} value={m.id}>
                {highKModel ? `High-K ${m.label}` : m.label}
              </option>
            ))}
          </SelectField>
          {highKModel ? null : (
            <SelectField label="Line" value={inputs.line} onChange={(e) => set({ line: e.target.value as FitLine })} disabled={!editable}>
              {FIT_LINES.map((l) => (
                <option key={l.id} value={l.id}>
                  {l.id === 'anchored' ? 'Anchored' : 'Free'}
                </option>
              ))}
            </SelectField>
          )}
        </div>
        {highKModel ? (
          <div className="space-y-2">
            <TextField
              label={`Effective length L_e (${units.length})`}
              name="effectiveLength"
              value={inputs.effectiveLength}
              onChange={(e) => set({ effectiveLength: e.target.value })}
              inputMode="decimal"
              autoComplete="off"
              readOnly={!editable}
              placeholder={effectiveLengthEstimateM === null ? undefined : displayValue(effectiveLengthEstimateM, units.length)}
              error={effectiveLengthError}
              hint={
                effectiveLengthEstimateM === null
                  ? 'The water column that moves: the well cannot estimate it (no static level to screen bottom), so enter it.'
                  : `The water column that moves. From the well: ${formatLengthIn(effectiveLengthEstimateM, units.length)} (L + (b/2)(rc/rs)²); left empty, the fit ${
                      inputs.fitEffectiveLength ? 'starts from' : 'holds'
                    } that.`
              }
            />
            <CheckboxField
              label="Fit L_e to the record"
              checked={inputs.fitEffectiveLength}
              onChange={(e) => set({ fitEffectiveLength: e.target.checked })}
              disabled={!editable}
              hint={inputs.fitEffectiveLength ? 'L_e is fitted with C_D; the value above is where the fit starts.' : 'L_e is held at the value above (or the estimate).'}
            />
          </div>
        ) : (
          <>
            <p className="-mt-2 text-xs text-slate-500">{FIT_LINES.find((l) => l.id === inputs.line)?.label}</p>
            {concave && inputs.line === 'anchored' && editable ? (
              <Alert tone="warning" title="Early data are concave upward">
                <p>A free line over the later segment is suggested (a double straight line, often filter-pack drainage).</p>
                <Button
                  variant="secondary"
                  size="sm"
                  className="mt-2"
                  onClick={() => set({ line: 'free', window: { kind: 'head', upper: LATE_SEGMENT.upper, lower: LATE_SEGMENT.lower } })}
                >
                  Fit a free line over H/H0 {LATE_SEGMENT.upper}–{LATE_SEGMENT.lower}
                </Button>
              </Alert>
            ) : null}
            <WindowFields
              window={inputs.window}
              resolved={view ? view.window : null}
              method={inputs.method}
              timeUnit={timeUnit}
              onChange={(window) => set({ window })}
              readOnly={!editable}
              error={windowError}
            />
          </>
        )}
        {!highKModel && (oscillationFlag || oscillationOverridden || inputs.allowOscillation) ? (
          <div className="space-y-2">
            {oscillationFlag ? (
              <Alert tone="error" title="The record oscillates">
                <p>{oscillationFlag.message}</p>
                <p className="mt-1">The high-K model (Springer-Gelhar) describes an oscillating or near-critical response; the straight line does not.</p>
                {editable ? (
                  <Button size="sm" className="mt-2" onClick={switchToHighK}>
                    Use the high-K model
                  </Button>
                ) : null}
              </Alert>
            ) : null}
            <CheckboxField
              label="Fit the straight line anyway (overdamped methods do not apply)"
              checked={inputs.allowOscillation}
              onChange={(e) => set({ allowOscillation: e.target.checked })}
              disabled={!editable}
              hint="The oscillation flag stays on the fit for the Checker."
            />
          </div>
        ) : null}
      </CardBody>
    </Card>
  );
  const resultCard = (
    <Card aria-labelledby="fit-result-title">
      <CardHeader titleId="fit-result-title" title="Result" />
      <CardBody className="space-y-4">
        {view ? (
          <FitResults
            view={view}
            kUnit={kUnit}
            onKUnitChange={setKUnit}
            units={units}
            timeUnit={timeUnit}
            anchored={inputs.line === 'anchored'}
            heading={resultHeading}
            sources={{ staticSource: reduced.staticSource, testStartSource: reduced.testStartSource, preTestCount: reduced.preTestCount }}
          />
        ) : (
          <Alert tone="warning" title="No result yet">
            {!parsed.geometry
              ? 'Complete the geometry to compute K.'
              : oscillationFlag
                ? 'The record oscillates: use the high-K model (under Model), or tick “Fit the straight line anyway”.'
                : (engineMessage ?? engineWindowError ?? Object.values(engineGeometryErrors)[0] ?? 'Adjust the inputs to compute K.')}
          </Alert>
        )}
        {view ? (
          <div className="space-y-2">
            <h3 className="text-sm font-semibold text-slate-900">QC flags</h3>
            <QcFlagList flags={view.flags} answering={answering} />
          </div>
        ) : null}
        <Cautions className="border-t border-slate-200 pt-3" />
      </CardBody>
    </Card>
  );

  return (
    <div className="min-w-0 space-y-6">
      <WorkspaceBar
        fit={fit}
        editable={editable}
        revising={revising}
        dirty={dirty}
        saving={save.isPending}
        saveBlocked={saveBlocked}
        saveError={saveErrors.message}
        onSave={onSave}
        onDiscard={() => setInputs(baseline)}
        onRevise={() => setRevising(true)}
        onCancelRevision={() => {
          setInputs(baseline);
          setRevising(false);
        }}
        submit={{ reasons, unanswered, onRefused: setSubmitErrors }}
      />
      {wide ? (
        <div className="grid min-w-0 grid-cols-[minmax(0,1fr)_24rem] gap-6">
          <div className="min-w-0 space-y-6">
            {plotCard}
            {geometryCard}
            {aside}
          </div>
          <div className="min-w-0 space-y-6">
            {methodCard}
            {resultCard}
          </div>
        </div>
      ) : (
        <div className="min-w-0 space-y-6">
          {plotCard}
          {resultCard}
          {methodCard}
          {geometryCard}
          {aside}
        </div>
      )}
    </div>
  );
}

/** Save, revise, submit and check, above the workspace so they are at hand at any width. */
function WorkspaceBar({
  fit,
  editable,
  revising,
  dirty,
  saving,
  saveBlocked,
  saveError,
  onSave,
  onDiscard,
  onRevise,
  onCancelRevision,
  submit,
}: {
  fit: Fit | null;
  /** What submitting sends and awaits: the reasons, how many K-changing flags are unanswered, where refusals go. */
  submit: SubmitAnswers;
  editable: boolean;
  revising: boolean;
  dirty: boolean;
  saving: boolean;
  saveBlocked: boolean;
  saveError?: string;
  onSave: () => void;
  onDiscard: () => void;
  onRevise: () => void;
  onCancelRevision: () => void;
}) {
  const state =
    fit === null
      ? 'Not saved yet: the result is a preview until you save the fit as a Draft.'
      : dirty
        ? 'Unsaved changes: the result is a preview until you save.'
        : fit.supersededAt
          ? 'Superseded by a later Checked revision; kept readable for the record.'
          : fit.status === 'draft'
            ? `Draft, saved ${formatDateTime(fit.updatedAt)}.${fit.can.submit ? ' Submit it for check when it is ready.' : ''}`
            : fit.status === 'sent-back'
              ? fit.can.edit
                ? 'Sent back: change what the Checker asked, save, then submit it again.'
                : 'Sent back to its preparer.'
              : fit.status === 'awaiting-check'
                ? fit.can.check
                  ? 'Awaiting your check: compare it with its record and parameters, then check it or send it back.'
                  : 'Awaiting check by one of the site’s Checkers; it cannot be changed meanwhile.'
                : fit.can.revise
                  ? 'Checked: it counts toward Well K. A change starts a new revision; this one stays as it is.'
                  : 'Checked: it counts toward Well K.';
  return (
    <Card as="div" className="px-4 py-3 sm:px-5">
      <div className="flex flex-col gap-3 md:flex-row md:items-start md:justify-between">
        <p className="text-sm text-slate-700 md:pt-2" role="status">
          {state}
        </p>
        <div className="flex min-w-0 flex-col gap-2 md:items-end">
          <div className="flex flex-wrap items-center gap-2 md:justify-end">
            {editable && (fit === null || dirty || revising) ? (
              <>
                {fit !== null && dirty ? (
                  <Button variant="ghost" onClick={onDiscard} disabled={saving}>
                    Discard changes
                  </Button>
                ) : null}
                {revising ? (
                  <Button variant="ghost" onClick={onCancelRevision} disabled={saving}>
                    Cancel the revision
                  </Button>
                ) : null}
                <Button onClick={onSave} pending={saving} disabled={saveBlocked || (fit !== null && !dirty)}>
                  {fit === null ? 'Save fit' : revising ? `Save as revision ${fit.revision + 1}` : 'Save changes'}
                </Button>
              </>
            ) : null}
            {fit?.can.revise && !revising ? (
              <Button variant="secondary" onClick={onRevise}>
                Start a revision
              </Button>
            ) : null}
            {fit ? <FitActions fit={fit} dirty={dirty} submitAnswers={submit} /> : null}
          </div>
          <FormError message={saveError} />
        </div>
      </div>
    </Card>
  );
}
