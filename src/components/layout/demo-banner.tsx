import { useInstance } from '@/features/dev-mail/api/get-instance';

/** On every screen in demo mode: the demo accounts are open to anyone who read the README. */
export function DemoBanner() {
  const instance = useInstance();
  if (!instance.data?.demoMode) return null;
  return (
    <div
      role="note"
      className="border-b border-warn/35 bg-warn-soft px-4 py-1.5 text-center text-xs text-ink"
      data-testid="demo-banner"
    >
      <strong className="font-semibold text-warn">Demo installation.</strong> The demo accounts have
      a published password, so anyone can sign in with them: real documents do not belong here.
    </div>
  );
}
