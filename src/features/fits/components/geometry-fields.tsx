import type { FitMethod } from '@shared/hydraulics/fitting';
import { effectiveCasingRadius } from '@shared/hydraulics/geometry';
import { lengthToSi } from '@shared/units/length';
import { Button } from '@/components/ui/button';
import { CheckboxField, SelectField, TextField } from '@/components/ui/field';
import { formatLengthIn } from '../format';
import {
  geometryFieldLabel,
  parseNumber,
  unitOfField,
  type GeometryDraft,
  type GeometryErrors,
  type GeometryField,
  type GeometryUnits,
} from '../geometry-form';

interface Props {
  draft: GeometryDraft;
  onChange: (draft: GeometryDraft) => void;
  units: GeometryUnits;
  method: FitMethod;
  errors: GeometryErrors;
  readOnly: boolean;
  onReset?: () => void;
  /** Filled in when the level is first said to move within the pack. */
  wellPorosity?: number | null;
  /** The well's intake radius, which every fit takes unless it overrides it. */
  wellIntake?: GeometryDraft['intake'];
}

const INTAKE_WORDS: Record<GeometryDraft['intake'], string> = { screen: 'screen', borehole: 'borehole' };

/** √((1 − n) rc² + n rw²) as typed so far, or null while a number is missing. */
function effectiveRadiusText(draft: GeometryDraft, units: GeometryUnits): string | null {
  const rc = parseNumber(draft.casingRadius);
  const rw = parseNumber(draft.boreholeRadius);
  const n = parseNumber(draft.filterPackPorosity);
  if (typeof rc !== 'number' || typeof rw !== 'number' || typeof n !== 'number' || !(rc > 0) || !(rw > 0) || !(n > 0 && n < 1)) return null;
  const r = effectiveCasingRadius(lengthToSi(rc, units.radius), lengthToSi(rw, units.radius), n).radiusM;
  return formatLengthIn(r, units.radius, 4);
}

export function GeometryFields({ draft, onChange, units, method, errors, readOnly, onReset, wellPorosity = null, wellIntake }: Props) {
  const set = (patch: Partial<GeometryDraft>) => onChange({ ...draft, ...patch });
  const field = (name: GeometryField, hint?: string) => {
    const unit = unitOfField(name, units);
    return (
      <TextField
        label={`${geometryFieldLabel(name)}${unit ? ` (${unit})` : ''}`}
        value={draft[name]}
        onChange={(e) => set({ [name]: e.target.value })}
        inputMode="decimal"
        autoComplete="off"
        readOnly={readOnly}
        error={errors[name]}
        hint={hint}
        name={name}
      />
    );
  };
  const effective = draft.inFilterPack ? effectiveRadiusText(draft, units) : null;
  return (
    <fieldset className="space-y-3">
      <legend className="sr-only">Geometry</legend>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-3 xl:grid-cols-4">
        {field('casingRadius', 'where the level moves')}
        {field('screenRadius')}
        {field('boreholeRadius', 'filter pack')}
        {field('screenLength', method === 'bouwer-rice' ? 'Le, the intake length' : 'L, the intake length')}
        <SelectField
          label="Intake radius"
          value={draft.intake}
          onChange={(e) => set({ intake: e.target.value as GeometryDraft['intake'] })}
          disabled={readOnly}
          hint={
            wellIntake === undefined
              ? undefined
              : draft.intake === wellIntake
                ? `The well’s ${INTAKE_WORDS[wellIntake]} radius`
                : `Overrides the well’s ${INTAKE_WORDS[wellIntake]} radius`
          }
          data-testid="intake-select"
          data-well-intake={wellIntake}
        >
          <option value="screen">Screen radius</option>
          <option value="borehole">Borehole radius</option>
        </SelectField>
        {field('anisotropyRatio', '1 when isotropic')}
        {method === 'bouwer-rice' ? (
          <>
            {field('staticToScreenBottom', 'Lw')}
            {field('saturatedThickness', 'D; Lw when fully penetrating')}
          </>
        ) : null}
      </div>
      <CheckboxField
        label="Water level moves within the filter pack"
        checked={draft.inFilterPack}
        onChange={(e) =>
          set({
            inFilterPack: e.target.checked,
            ...(e.target.checked && draft.filterPackPorosity.trim() === '' && wellPorosity !== null ? { filterPackPorosity: String(wellPorosity) } : {}),
          })
        }
        disabled={readOnly}
        hint={`Uses the effective casing radius √((1 − n) rc² + n rw²)${wellPorosity !== null ? `; the well’s filter-pack porosity is ${wellPorosity}` : ''}`}
      />
      {draft.inFilterPack ? (
        <div className="grid grid-cols-2 items-start gap-3 sm:grid-cols-3 xl:grid-cols-4">
          {field('filterPackPorosity', 'n, between 0 and 1')}
          <div className="space-y-1.5 text-sm">
            <p className="font-medium text-slate-800">Effective casing radius</p>
            <p className="py-2 text-slate-900 tabular-nums" data-testid="effective-casing-radius">
              {effective ?? '—'}
            </p>
          </div>
        </div>
      ) : null}
      {onReset && !readOnly ? (
        <Button variant="ghost" size="sm" onClick={onReset}>
          Use the well’s values
        </Button>
      ) : null}
    </fieldset>
  );
}
