import type { DataSource } from 'typeorm';
import { unansweredFlags } from '@shared/hydraulics/flag-answers';
import type { Fit } from '@shared/schemas/fits';
import type { Config } from '../../config';
import { createFitsService, type Actor } from '../../features/fits/fits.service';
import { discardingOutbox } from '../../features/mail/outbox';
import { RecordEntity } from '../../features/records/record.entity';
import { Site } from '../../features/sites/site.entity';
import { User } from '../../features/users/user.entity';
import { Well } from '../../features/wells/well.entity';
import { AppError } from '../../lib/errors';
import { DEMO_USERS } from './demo';

/** The demo's fits are invented like the rest: made by the engine from the invented records. */

type Plan = 'checked' | 'checked-by-lead' | 'awaiting-check' | 'sent-back' | 'draft';
// Most wells carry a Checked fit so the map has colour; a few fits stand in every other state.
const PLANS: Plan[] = ['checked', 'checked', 'checked-by-lead', 'checked', 'awaiting-check', 'checked', 'sent-back', 'checked', 'draft', 'checked'];

/** Reasons the invented analyst gives for keeping a fit despite a flag that changes K (see flag-answers.ts). */
const DEMO_REASONS: Record<string, string> = {
  'window-outside-recommended': 'Too few readings fall in the recommended range of this record; the wider window was kept (invented demo reason).',
  'concave-upward': 'Kept the anchored line so the Checker can compare it with a free line over the later segment (invented demo reason).',
  'h0-mismatch': 'The slug volume in the field notes is doubtful; H0 is read from the record (invented demo reason).',
  'intake-screen-in-filter-pack': 'The filter pack is finer than the formation here, so the screen radius is the intake (invented demo reason).',
};

/** The demo analyst's answers to a fit's open K-changing flags: a reason for each. */
export function demoReasons(fit: Fit): Record<string, string> {
  const choices = { method: fit.method, line: fit.line, window: fit.result.window };
  return Object.fromEntries(unansweredFlags(fit.flags, choices, fit.flagReasons).map((code) => [code, DEMO_REASONS[code] ?? 'Kept as prepared for the demo scenario (invented demo reason).']));
}

/** Fits in every state of the lifecycle, prepared and checked by different demo users. */
export async function seedDemoFits(ds: DataSource, config: Config): Promise<number> {
  const site = await ds.getRepository(Site).findOne({ where: { isDemo: true } });
  if (!site) return 0;
  const userByRole = async (role: string) => {
    const email = DEMO_USERS.find((u) => u.role === role)!.email;
    return ds.getRepository(User).findOneOrFail({ where: { email } });
  };
  const [analyst, checker, lead] = await Promise.all([userByRole('Analyst'), userByRole('Checker'), userByRole('Lead')]);
  const as = (u: User, role: Actor['role']): Actor => ({ user: { id: u.id, email: u.email, name: u.name, isAdmin: false, disabled: false }, role });
  const svc = createFitsService({ ds, config, outbox: discardingOutbox });

  const records = await ds.getRepository(RecordEntity).find({ where: { siteId: site.id }, order: { createdAt: 'ASC' } });
  const wells = new Map((await ds.getRepository(Well).find({ where: { siteId: site.id } })).map((w) => [w.id, w]));
  records.sort((a, b) => (wells.get(a.wellId)?.name ?? '').localeCompare(wells.get(b.wellId)?.name ?? '') || a.createdAt.getTime() - b.createdAt.getTime());

  let made = 0;
  // Plans go by straight-line fits made, so every state appears whichever records the engine refuses.
  let lineFits = 0;
  for (const [i, record] of records.entries()) {
    let plan = PLANS[lineFits % PLANS.length];
    const preparer = plan === 'checked-by-lead' ? as(analyst, 'Analyst') : i % 7 === 3 ? as(lead, 'Lead') : as(analyst, 'Analyst');
    const reviewer = plan === 'checked-by-lead' || preparer.user.id === checker.id ? as(lead, 'Lead') : as(checker, 'Checker');
    const method = i % 3 === 2 ? 'bouwer-rice' : 'hvorslev';
    let fit;
    for (const m of method === 'bouwer-rice' ? (['bouwer-rice', 'hvorslev'] as const) : (['hvorslev'] as const)) {
      try {
        fit = await svc.create(record.id, preparer, { method: m, model: 'line', line: 'anchored', geometry: {}, options: { allowOscillation: false }, note: '' });
        break;
      } catch (e) {
        // A well whose construction a method refuses falls back to Hvorslev.
        if (!(e instanceof AppError && e.status === 400)) throw e;
        // The oscillating demo record gets the high-K model (Hvorslev variant, L_e fitted) instead.
        if (e.code === 'OSCILLATING') {
          fit = await svc.create(record.id, preparer, {
            method: 'hvorslev',
            model: 'high-k',
            line: 'anchored',
            geometry: {},
            options: { allowOscillation: false, highK: { fitEffectiveLength: true } },
            note: 'Oscillating record: fitted with the high-K model (invented demo note).',
          });
          // Checked, so the oscillating well has its Well K on the map; the line fits keep their plans.
          plan = 'checked';
          break;
        }
      }
    }
    if (!fit) continue;
    made++;
    if (fit.model === 'line') lineFits++;
    if (plan === 'draft') continue;
    await svc.submit(fit.id, preparer, demoReasons(fit));
    if (plan === 'awaiting-check') continue;
    if (plan === 'sent-back') {
      await svc.check(fit.id, reviewer, 'sent-back', 'The early readings curve upward: try a free line over the later segment, and confirm the screen length from the boring log.');
      continue;
    }
    await svc.check(fit.id, plan === 'checked-by-lead' ? as(lead, 'Lead') : reviewer, 'checked', '');
  }
  return made;
}
