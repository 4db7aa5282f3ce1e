import { type SelectHTMLAttributes, forwardRef, useId } from 'react';
import { cn } from '../../lib/cn';
import { inputBase, inputSize } from './text-field';

export interface SelectOption {
  value: string;
  label: string;
}

export interface SelectProps extends SelectHTMLAttributes<HTMLSelectElement> {
  /** Visible label; use `aria-label` instead when the context already labels it. */
  label?: string;
  options: readonly SelectOption[];
  error?: string | null;
  /** A shorter control for table rows and toolbars. */
  compact?: boolean;
}

// A quiet chevron drawn in the ink-muted colour, so the native menu keeps its keyboard behaviour.
const chevron =
  "bg-[url(\"data:image/svg+xml,%3Csvg xmlns='http://www.w3.org/2000/svg' width='10' height='6' viewBox='0 0 10 6'%3E%3Cpath d='M1 1l4 4 4-4' fill='none' stroke='%23545b63' stroke-width='1.5'/%3E%3C/svg%3E\")] bg-[length:10px_6px] bg-[position:right_0.6rem_center] bg-no-repeat appearance-none";

export const Select = forwardRef<HTMLSelectElement, SelectProps>(function Select(
  { label, options, error, compact = false, className, id, ...rest },
  ref,
) {
  const generated = useId();
  const selectId = id ?? generated;
  const errorId = error ? `${selectId}-error` : undefined;
  return (
    <div className={cn(label ? 'space-y-1' : undefined, className)}>
      {label ? (
        <label htmlFor={selectId} className="block text-[13px] font-medium text-ink">
          {label}
        </label>
      ) : null}
      <select
        ref={ref}
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={errorId}
        className={cn(
          inputBase,
          chevron,
          compact ? 'h-7 pr-7 pl-2 text-[13px]' : `${inputSize} pr-7`,
        )}
        {...rest}
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      {error ? (
        <p id={errorId} className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
});
