import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

/*
 * Below the `sm` breakpoint a stacked table shows each row as a small card: cells become
 * "label … value" lines (the label comes from the cell's data-label) and the header row is kept
 * for screen readers only. Other tables scroll sideways inside their card instead of clipping.
 */
const stacked = cn(
  'max-sm:block max-sm:min-w-0 max-sm:[&_tbody]:block max-sm:[&_thead]:sr-only',
  'max-sm:[&_tr]:block max-sm:[&_tr]:border-b max-sm:[&_tr]:border-slate-200 max-sm:[&_tr]:px-4 max-sm:[&_tr]:py-3',
  'max-sm:[&_td]:flex max-sm:[&_td]:min-h-9 max-sm:[&_td]:items-center max-sm:[&_td]:justify-between max-sm:[&_td]:gap-4',
  'max-sm:[&_td]:border-0 max-sm:[&_td]:px-0 max-sm:[&_td]:py-1 max-sm:[&_td]:text-right',
  'max-sm:[&_td]:before:shrink-0 max-sm:[&_td]:before:text-left max-sm:[&_td]:before:text-xs',
  'max-sm:[&_td]:before:text-slate-500 max-sm:[&_td]:before:content-[attr(data-label)]',
);

export function Table({
  children,
  caption,
  minWidth = 'min-w-[40rem]',
  stackOnMobile = false,
}: {
  children: ReactNode;
  caption: string;
  minWidth?: string;
  stackOnMobile?: boolean;
}) {
  return (
    <div className="overflow-x-auto">
      <table className={cn('w-full border-collapse text-left text-sm', minWidth, stackOnMobile && stacked)}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ className, ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={cn(
        'border-b border-slate-200 bg-slate-50 px-4 py-2 text-xs font-medium tracking-wide text-slate-600 uppercase',
        className,
      )}
      {...rest}
    />
  );
}

/** `label` names the cell's column on narrow screens, where a stacked table hides its header. */
export function Td({ className, label, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { label?: string }) {
  return (
    <td
      data-label={label}
      className={cn('border-b border-slate-100 px-4 py-3 align-middle text-slate-800', className)}
      {...rest}
    />
  );
}
