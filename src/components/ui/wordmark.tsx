import { cn } from '@/lib/cn';

/** Kfield's mark: a K beside three falling-head steps settling to a level. */
export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={cn('inline-flex items-center gap-2 text-slate-900', className)}>
      <svg viewBox="0 0 28 28" className="size-7" aria-hidden="true">
        <rect width="28" height="28" rx="6" className="fill-accent-700" />
        <path d="M8 7v14M8 14.5 15.5 7M10.5 12.5 16 21" stroke="white" strokeWidth="2.2" strokeLinecap="round" fill="none" />
        <path d="M18 10h3M18 14h2.5M18 18h2" stroke="#aee4dd" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
      <span className="text-lg font-semibold tracking-tight">Kfield</span>
    </span>
  );
}
