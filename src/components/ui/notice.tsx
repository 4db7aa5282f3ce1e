import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

type Tone = 'info' | 'ok' | 'warn' | 'danger';

const tones: Record<Tone, string> = {
  info: 'border-info/35 bg-info-soft text-info',
  ok: 'border-ok/35 bg-ok-soft text-ok',
  warn: 'border-warn/35 bg-warn-soft text-warn',
  danger: 'border-danger/35 bg-danger-soft text-danger',
};

/** An inline message. Danger and warnings are announced at once (role=alert). */
export function Notice({
  tone = 'info',
  title,
  children,
  className,
  action,
}: {
  tone?: Tone;
  title?: string;
  children?: ReactNode;
  className?: string;
  action?: ReactNode;
}) {
  return (
    <div
      role={tone === 'danger' || tone === 'warn' ? 'alert' : 'status'}
      className={cn(
        'flex items-start gap-3 rounded-md border px-3 py-2 text-sm',
        tones[tone],
        className,
      )}
    >
      <div className="min-w-0 flex-1">
        {title ? <p className="font-semibold">{title}</p> : null}
        {children ? <div className="text-ink">{children}</div> : null}
      </div>
      {action ? <div className="shrink-0">{action}</div> : null}
    </div>
  );
}
