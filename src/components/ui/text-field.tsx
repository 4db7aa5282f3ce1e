import { type InputHTMLAttributes, forwardRef, useId } from 'react';
import { cn } from '@/lib/cn';

/** Shared look of inputs and selects; sizes are separate so they never conflict. */
export const inputBase =
  'block w-full rounded-md border border-line-strong bg-panel text-ink placeholder:text-ink-faint ' +
  'aria-[invalid=true]:border-danger disabled:bg-sunk disabled:text-ink-muted';
export const inputSize = 'h-9 px-2.5 text-sm';
export const inputClass = `${inputBase} ${inputSize}`;

export interface TextFieldProps extends InputHTMLAttributes<HTMLInputElement> {
  label: string;
  /** A short hint under the label. */
  hint?: string;
  error?: string | null;
}

/** A labelled input with its hint and error wired up for assistive technology. */
export const TextField = forwardRef<HTMLInputElement, TextFieldProps>(function TextField(
  { label, hint, error, className, id, ...rest },
  ref,
) {
  const generated = useId();
  const inputId = id ?? generated;
  const hintId = hint ? `${inputId}-hint` : undefined;
  const errorId = error ? `${inputId}-error` : undefined;
  return (
    <div className={cn('space-y-1', className)}>
      <label htmlFor={inputId} className="block text-[13px] font-medium text-ink">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-xs text-ink-muted">
          {hint}
        </p>
      ) : null}
      <input
        ref={ref}
        id={inputId}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errorId].filter(Boolean).join(' ') || undefined}
        className={inputClass}
        {...rest}
      />
      {error ? (
        <p id={errorId} className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
});
