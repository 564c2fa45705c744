import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

type Tone = 'error' | 'info' | 'success' | 'warning';

const tones: Record<Tone, string> = {
  error: 'bg-red-50 text-red-800 ring-red-200',
  info: 'bg-slate-100 text-slate-800 ring-slate-200',
  success: 'bg-accent-50 text-accent-800 ring-accent-200',
  warning: 'bg-amber-50 text-amber-900 ring-amber-200',
};

export function Alert({
  tone = 'info',
  title,
  children,
  className,
}: {
  tone?: Tone;
  title?: ReactNode;
  children?: ReactNode;
  className?: string;
}) {
  return (
    <div
      role={tone === 'error' ? 'alert' : 'status'}
      className={cn('rounded-md px-4 py-3 text-sm ring-1 ring-inset', tones[tone], className)}
    >
      {title ? <p className="font-medium">{title}</p> : null}
      {children ? <div className={title ? 'mt-1' : undefined}>{children}</div> : null}
    </div>
  );
}
