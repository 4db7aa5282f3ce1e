import type { AnchorHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

/** A file download (CSV exports) styled as a secondary button; the browser saves the answer. */
export function DownloadLink({ className, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement>) {
  return (
    <a
      download
      className={cn(
        'inline-flex h-9 items-center rounded-md border border-line-strong bg-panel px-3 text-sm font-medium hover:bg-sunk',
        className,
      )}
      {...rest}
    />
  );
}
