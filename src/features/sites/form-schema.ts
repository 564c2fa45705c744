import { z } from 'zod';
import { hydroUnitNameSchema, siteBodySchema, type Site } from '@shared/schemas/sites';

/**
 * The site form keeps hydrostratigraphic units as `{ name }` rows (react-hook-form's field
 * arrays need objects), checks each row where the person typed it, then hands the flat body to
 * the shared siteBodySchema, the same one the server applies.
 */
export const siteFormSchema = z
  .object({
    name: siteBodySchema.shape.name,
    description: siteBodySchema.shape.description,
    epsgCode: siteBodySchema.shape.epsgCode,
    displayUnits: siteBodySchema.shape.displayUnits,
    hydroUnits: z.array(z.object({ name: hydroUnitNameSchema })).superRefine((rows, ctx) => {
      const seen = new Set<string>();
      rows.forEach((row, index) => {
        const key = row.name.trim().toLowerCase();
        if (key && seen.has(key)) {
          ctx.addIssue({ code: 'custom', path: [index, 'name'], message: 'This unit is already in the list' });
        }
        seen.add(key);
      });
    }),
  })
  .transform((values, ctx) => {
    const body = siteBodySchema.safeParse({ ...values, hydroUnits: values.hydroUnits.map((row) => row.name) });
    if (body.success) return body.data;
    for (const issue of body.error.issues) {
      // A unit's issue at ["hydroUnits", 2] belongs to the row's input, ["hydroUnits", 2, "name"].
      const path = issue.path[0] === 'hydroUnits' && typeof issue.path[1] === 'number' ? [...issue.path, 'name'] : issue.path;
      ctx.addIssue({ code: 'custom', message: issue.message, path });
    }
    return z.NEVER;
  });

export type SiteFormValues = z.input<typeof siteFormSchema>;
export type SiteFormOutput = z.output<typeof siteFormSchema>;

export const emptySiteForm: SiteFormValues = {
  name: '',
  description: '',
  epsgCode: '',
  displayUnits: 'SI',
  hydroUnits: [],
};

export function siteToForm(site: Site): SiteFormValues {
  return {
    name: site.name,
    description: site.description,
    epsgCode: String(site.epsgCode),
    displayUnits: site.displayUnits,
    hydroUnits: site.hydroUnits.map((name) => ({ name })),
  };
}
