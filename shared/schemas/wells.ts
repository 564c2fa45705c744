import { z } from 'zod';

export const AQUIFER_CONDITIONS = ['confined', 'unconfined', 'leaky'] as const;
export const aquiferConditionSchema = z.enum(AQUIFER_CONDITIONS, { error: 'Choose confined, unconfined or leaky' });
export type AquiferCondition = z.infer<typeof aquiferConditionSchema>;

export const WELL_STATUSES = ['active', 'inactive', 'decommissioned'] as const;
export const wellStatusSchema = z.enum(WELL_STATUSES, { error: 'Choose active, inactive or decommissioned' });
export type WellStatus = z.infer<typeof wellStatusSchema>;
