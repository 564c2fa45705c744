import { useState, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

/** A collapsible panel of the workspace: over the map on a wide screen, in the bottom sheet on a phone. */
export function Panel({
  title,
  titleId,
  actions,
  defaultOpen = true,
  className,
  children,
  testId,
  onOpenChange,
}: {
  title: ReactNode;
  titleId: string;
  actions?: ReactNode;
  defaultOpen?: boolean;
  className?: string;
  children: ReactNode;
  testId?: string;
  onOpenChange?: (open: boolean) => void;
}) {
  const [open, setOpenState] = useState(defaultOpen);
  const setOpen = (update: (o: boolean) => boolean) => {
    const next = update(open);
    setOpenState(next);
    onOpenChange?.(next);
  };
  return (
    <section
      aria-labelledby={titleId}
      className={cn('pointer-events-auto rounded-lg bg-white shadow-md ring-1 ring-slate-300', className)}
      data-testid={testId}
      data-open={open}
    >
      <div className="flex items-center gap-2 px-3 py-1.5">
        <h2 id={titleId} className="min-w-0 flex-1 text-sm font-semibold text-slate-900">
          <button type="button" className="flex w-full items-center gap-1.5 rounded py-1 text-left" aria-expanded={open} onClick={() => setOpen((o) => !o)}>
            <svg aria-hidden="true" viewBox="0 0 16 16" className={cn('size-3.5 shrink-0 text-slate-500 transition-transform', open && 'rotate-90')} fill="currentColor">
              <path d="M6 3.5 11 8l-5 4.5z" />
            </svg>
            <span className="min-w-0 truncate">{title}</span>
          </button>
        </h2>
        {actions && open ? <div className="flex shrink-0 items-center gap-1.5">{actions}</div> : null}
      </div>
      {open ? <div className="border-t border-slate-200 px-3 py-3">{children}</div> : null}
    </section>
  );
}
