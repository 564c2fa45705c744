/** The cautions Kfield shows wherever results are shown (fit workspace, reports, viewer page), verbatim from the product brief. */
export const CAUTIONS: readonly string[] = [
  'Slug-test K describes only the formation close to the screen and is sensitive to well development, skin and the chosen fitting window; ' +
    'interpolated K between wells is an estimate, not a measurement; capture sketches are screening estimates that assume a homogeneous, ' +
    'isotropic aquifer in uniform flow.',
  'Results support, and do not replace, the judgement of a licensed geologist or engineer and the rules of the local regulator.',
  'Handling of purge water from contaminated wells follows local rules.',
];
