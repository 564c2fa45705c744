import type { DataSource } from 'typeorm';
import { captureSketchBodySchema } from '@shared/schemas/ksurface';
import type { Config } from '../../config';
import { createFitsService, type Actor } from '../../features/fits/fits.service';
import { createOutlinesService } from '../../features/ksurface/outlines.service';
import { createSketchesService } from '../../features/ksurface/sketches.service';
import { discardingOutbox } from '../../features/mail/outbox';
import { Site } from '../../features/sites/site.entity';
import { User } from '../../features/users/user.entity';
import { Well } from '../../features/wells/well.entity';
import { DEMO_USERS } from './demo';
import { demoReasons } from './demo-fits';
import { seedDemoChannelRecords } from './demo-records';
import { DEMO_ORIGIN } from './demo-wells';

/*
 * The demo's K surface material, invented like the rest: re-tests along the buried channel fitted and
 * checked through the fit service, an invented dissolved-phase plume outline east of the former
 * tanker yard and tank field (toward the river, the way the invented heads fall), and one capture
 * sketch between the plume and the river bank.
 */

/** The plume outline, as offsets (m) from the demo origin on the site's EPSG:32632. */
const PLUME_OUTLINE_M: [number, number][] = [
  [-300, -330], [100, -370], [330, -320], [370, -150], [365, 100], [380, 290], [300, 360], [60, 350], [-200, 280], [-350, 150], [-380, -150], [-300, -330],
];
export const DEMO_OUTLINE_NAME = 'Dissolved-phase plume (invented)';
export const DEMO_SKETCH_NAME = 'Trial extraction well EW-1 (invented)';
/** Between the plume's downgradient edge and the river bank. */
const SKETCH_AT_M: [number, number] = [425, -20];
const GRADIENT_WELLS = ['MW-04', 'MW-06', 'MW-11', 'MW-13'];

export async function seedDemoSurface(ds: DataSource, config: Config): Promise<void> {
  const site = await ds.getRepository(Site).findOne({ where: { isDemo: true } });
  if (!site) return;
  const user = async (role: string) => ds.getRepository(User).findOneOrFail({ where: { email: DEMO_USERS.find((u) => u.role === role)!.email } });
  const [analyst, checker, lead] = await Promise.all([user('Analyst'), user('Checker'), user('Lead')]);
  const as = (u: User, role: Actor['role']): Actor => ({ user: { id: u.id, email: u.email, name: u.name, isAdmin: false, disabled: false }, role });
  const ctx = { ds, config, outbox: discardingOutbox };
  const fits = createFitsService(ctx);

  const recordIds = await ds.transaction((m) => seedDemoChannelRecords(m, site));
  for (const recordId of recordIds) {
    const fit = await fits.create(recordId, as(analyst, 'Analyst'), { method: 'hvorslev', model: 'line', line: 'anchored', geometry: {}, options: { allowOscillation: false }, note: '' });
    await fits.submit(fit.id, as(analyst, 'Analyst'), demoReasons(fit));
    await fits.check(fit.id, as(checker, 'Checker'), 'checked', '');
  }

  const at = ([dx, dy]: [number, number]) => [DEMO_ORIGIN.easting + dx, DEMO_ORIGIN.northing + dy];
  await createOutlinesService(ctx).create(site.id, lead.id, {
    name: DEMO_OUTLINE_NAME,
    crs: 'site',
    geometry: { type: 'Polygon', coordinates: [PLUME_OUTLINE_M.map(at)] },
  });

  const wells = await ds.getRepository(Well).find({ where: { siteId: site.id } });
  const [x, y] = at(SKETCH_AT_M);
  await createSketchesService(ctx).create(site.id, analyst.id, captureSketchBodySchema.parse({
    name: DEMO_SKETCH_NAME,
    x, y,
    // A modest trial rate: the demo gradient is gentle (~0.001), so 0.4 L/s already catches ~200 m far upgradient.
    rate: { value: 0.4, unit: 'L/s' },
    thicknessM: 9.6,
    gradient: { mode: 'wells', wellIds: wells.filter((w) => GRADIENT_WELLS.includes(w.name)).map((w) => w.id) },
    notes: 'Invented demo sketch: K from the surface at the spot, gradient from four wells’ static levels.',
  }));
}
