import { Badge } from '@/components/ui/badge';
import { FIT_STATUS_LABELS, type FitStatus } from '@shared/schemas/fits';

const TONES = { draft: 'neutral', 'awaiting-check': 'warning', checked: 'accent', 'sent-back': 'danger' } as const;

export function FitStatusBadge({ status, superseded = false }: { status: FitStatus; superseded?: boolean }) {
  return (
    <span className="inline-flex flex-wrap items-center gap-1">
      <Badge tone={TONES[status]}>{FIT_STATUS_LABELS[status]}</Badge>
      {superseded ? <Badge tone="neutral">Superseded</Badge> : null}
    </span>
  );
}
