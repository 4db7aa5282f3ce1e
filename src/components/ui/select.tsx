import { type SelectHTMLAttributes, forwardRef, useId } from 'react';
import { cn } from '@/lib/cn';
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

// The arrow is the select-chevron utility in styles.css.
const chevron = 'select-chevron';

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
