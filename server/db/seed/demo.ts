import type { DataSource } from 'typeorm';
import type { SiteRole } from '@shared/schemas/common';
import type { Config } from '../../config';
import { seedDemoFits } from './demo-fits';
import { hashPassword } from '../../auth/password';
import { lookupCrs } from '../../features/sites/crs';
import { Membership } from '../../features/sites/membership.entity';
import { Site } from '../../features/sites/site.entity';
import { User } from '../../features/users/user.entity';
import { seedDemoRecords } from './demo-records';
import { seedDemoSurface } from './demo-surface';
import { seedDemoWells } from './demo-wells';

/** Everything below is invented for the demo: no real site, person or data. */
export const DEMO_PASSWORD = 'kfield-demo-pass';

export const DEMO_USERS: { email: string; name: string; isAdmin: boolean; role: SiteRole | null }[] = [
  { email: 'admin@demo.kfield.example', name: 'Rowan Pike', isAdmin: true, role: null },
  { email: 'lead@demo.kfield.example', name: 'Mara Lindqvist', isAdmin: false, role: 'Lead' },
  { email: 'analyst@demo.kfield.example', name: 'Tomas Ferreira', isAdmin: false, role: 'Analyst' },
  { email: 'checker@demo.kfield.example', name: 'Ines Okafor', isAdmin: false, role: 'Checker' },
  { email: 'viewer@demo.kfield.example', name: 'Sam Whitlow', isAdmin: false, role: 'Viewer' },
];

export const DEMO_SITE = {
  name: 'Willow Bend former fuel depot (fictional)',
  description:
    'Invented demo scenario: a fictional former fuel depot beside a small river, with monitoring wells in a sand-and-gravel aquifer over silt, a dissolved-phase plume and a buried higher-K channel. No real site, person or data.',
  epsgCode: 32632,
  displayUnits: 'SI' as const,
  hydroUnits: ['Sand and gravel', 'Buried channel gravel', 'Silt'],
};

/** Load the demo scenario into an empty database only; never over real data. */
export async function seedDemoIfEmpty(ds: DataSource, config: Config): Promise<boolean> {
  if ((await ds.getRepository(User).count()) > 0) return false;
  const passwordHash = await hashPassword(DEMO_PASSWORD, config.BCRYPT_COST);
  const crs = lookupCrs(DEMO_SITE.epsgCode);
  await ds.transaction(async (m) => {
    const site = await m.getRepository(Site).save(m.getRepository(Site).create({ ...DEMO_SITE, crsName: crs?.name ?? `EPSG:${DEMO_SITE.epsgCode}`, isDemo: true }));
    await seedDemoWells(m, site);
    for (const u of DEMO_USERS) {
      const user = await m.getRepository(User).save(
        m.getRepository(User).create({ email: u.email, name: u.name, isAdmin: u.isAdmin, disabled: false, passwordHash }),
      );
      if (u.role) await m.getRepository(Membership).insert({ siteId: site.id, userId: user.id, role: u.role });
    }
    await seedDemoRecords(m, site);
  });
  // Fits go through the fit service (its own transactions), after the records exist.
  await seedDemoFits(ds, config);
  await seedDemoSurface(ds, config);
  return true;
}
