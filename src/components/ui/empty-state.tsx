import type { ReactNode } from 'react';

export function EmptyState({
  title,
  children,
  action,
}: {
  title: string;
  children?: ReactNode;
  action?: ReactNode;
}) {
  return (
    <div className="rounded-md border border-dashed border-line-strong bg-panel/60 px-6 py-8 text-center">
      <p className="font-medium text-ink">{title}</p>
      {children ? (
        <div className="mx-auto mt-1 max-w-prose text-sm text-ink-muted">{children}</div>
      ) : null}
      {action ? <div className="mt-4">{action}</div> : null}
    </div>
  );
}
