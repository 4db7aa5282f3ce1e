import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

/** A dense, ruled data table. `caption` names it for screen readers. */
export function Table({
  caption,
  captionVisible = false,
  children,
  className,
  ...rest
}: HTMLAttributes<HTMLTableElement> & { caption: string; captionVisible?: boolean }) {
  return (
    <div className="overflow-x-auto rounded-md border border-line bg-panel">
      <table className={cn('w-full border-collapse text-sm', className)} {...rest}>
        <caption
          className={captionVisible ? 'px-3 py-2 text-left text-[13px] text-ink-muted' : 'sr-only'}
        >
          {caption}
        </caption>
        {children}
      </table>
    </div>
  );
}

export function THead({ children }: { children: ReactNode }) {
  return <thead className="bg-sunk/70 text-left">{children}</thead>;
}

export function TBody({ children }: { children: ReactNode }) {
  return <tbody className="divide-y divide-line">{children}</tbody>;
}

export function Tr({ className, ...rest }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cn('hover:bg-paper/80', className)} {...rest} />;
}

export function Th({ className, ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={cn(
        'border-b border-line px-3 py-1.5 text-xs font-semibold tracking-wide text-ink-muted uppercase',
        className,
      )}
      {...rest}
    />
  );
}

export function Td({ className, ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return <td className={cn('px-3 py-1.5 align-middle', className)} {...rest} />;
}
