import type { WellStatus } from '@shared/schemas/wells';
import { Badge } from '@/components/ui/badge';

export const STATUS_LABELS: Record<WellStatus, string> = { active: 'Active', inactive: 'Inactive', decommissioned: 'Decommissioned' };

export function StatusBadge({ status }: { status: WellStatus }) {
  return <Badge tone={status === 'active' ? 'accent' : status === 'inactive' ? 'warning' : 'neutral'}>{STATUS_LABELS[status]}</Badge>;
}
