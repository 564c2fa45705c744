import { useId, type InputHTMLAttributes, type ReactNode, type Ref, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

const control =
  'block rounded-md border-0 bg-white px-3 py-2 text-sm text-slate-900 shadow-sm ring-1 ring-inset ' +
  'ring-slate-300 focus-visible:outline-2 focus-visible:outline-offset-0 ' +
  'focus-visible:outline-accent-600 disabled:bg-slate-100 disabled:text-slate-500 read-only:bg-slate-50 read-only:text-slate-600 ' +
  'aria-[invalid=true]:ring-red-400';

type FieldFrameProps = {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  children: ReactNode;
};

function FieldFrame({ id, label, hint, error, className, children }: FieldFrameProps) {
  return (
    <div className={cn('space-y-1.5', className)}>
      <label htmlFor={id} className="block text-sm font-medium text-slate-800">
        {label}
      </label>
      {children}
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-xs text-slate-500">
          {hint}
        </p>
      ) : null}
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

export function FieldError({ id, message }: { id?: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="text-sm text-red-700">
      {message}
    </p>
  );
}

function describedBy(id: string, hint: unknown, error: unknown, extra?: string): string | undefined {
  const ids = [error ? `${id}-error` : hint ? `${id}-hint` : null, extra].filter(Boolean);
  return ids.length > 0 ? ids.join(' ') : undefined;
}

type Common = { label: ReactNode; hint?: ReactNode; error?: string; className?: string };

export function TextField({
  label,
  hint,
  error,
  className,
  id: givenId,
  ref,
  'aria-describedby': extraDescribedBy,
  ...input
}: Common & InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> }) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      <input
        id={id}
        ref={ref}
        className={cn(control, 'w-full')}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error, extraDescribedBy)}
        {...input}
      />
    </FieldFrame>
  );
}

export function TextAreaField({
  label,
  hint,
  error,
  className,
  id: givenId,
  ref,
  'aria-describedby': extraDescribedBy,
  ...input
}: Common & TextareaHTMLAttributes<HTMLTextAreaElement> & { ref?: Ref<HTMLTextAreaElement> }) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      <textarea
        id={id}
        ref={ref}
        rows={3}
        className={cn(control, 'w-full resize-y')}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error, extraDescribedBy)}
        {...input}
      />
    </FieldFrame>
  );
}

export function SelectField({
  label,
  hint,
  error,
  className,
  id: givenId,
  ref,
  children,
  'aria-describedby': extraDescribedBy,
  ...select
}: Common & SelectHTMLAttributes<HTMLSelectElement> & { ref?: Ref<HTMLSelectElement> }) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      <select
        id={id}
        ref={ref}
        className={cn(control, 'w-full pr-8')}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error, extraDescribedBy)}
        {...select}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

/** A bare select for tables, where the label is visually hidden but still names the control. */
export function InlineSelect({
  label,
  className,
  ref,
  children,
  ...select
}: { label: string } & SelectHTMLAttributes<HTMLSelectElement> & { ref?: Ref<HTMLSelectElement> }) {
  const id = useId();
  return (
    <>
      <label htmlFor={id} className="sr-only">
        {label}
      </label>
      <select id={id} ref={ref} className={cn(control, 'h-8 py-1 pr-8', className)} {...select}>
        {children}
      </select>
    </>
  );
}

export function CheckboxField({
  label,
  hint,
  error,
  className,
  id: givenId,
  ref,
  'aria-describedby': extraDescribedBy,
  ...input
}: Common & Omit<InputHTMLAttributes<HTMLInputElement>, 'type'> & { ref?: Ref<HTMLInputElement> }) {
  const autoId = useId();
  const id = givenId ?? autoId;
  return (
    <div className={cn('space-y-1', className)}>
      <div className="flex items-start gap-3">
        <input
          id={id}
          ref={ref}
          type="checkbox"
          className="mt-0.5 size-4 rounded border-slate-300 accent-accent-700"
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, hint, error, extraDescribedBy)}
          {...input}
        />
        <label htmlFor={id} className="text-sm text-slate-800">
          {label}
        </label>
      </div>
      {hint && !error ? (
        <p id={`${id}-hint`} className="pl-7 text-xs text-slate-500">
          {hint}
        </p>
      ) : null}
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}
