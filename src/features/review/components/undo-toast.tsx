import { useEffect } from 'react';
import { Kbd } from './key-legend';

export const UNDO_MS = 6000;

/** A brief "removed X — Undo" after a key removed or replaced a code. */
export function UndoToast({
  message,
  onUndo,
  onDone,
}: {
  message: string;
  onUndo: () => void;
  onDone: () => void;
}) {
  useEffect(() => {
    const timer = window.setTimeout(onDone, UNDO_MS);
    return () => window.clearTimeout(timer);
  }, [message, onDone]);
  return (
    <div
      role="status"
      className="fixed bottom-4 left-1/2 z-50 flex -translate-x-1/2 items-center gap-3 rounded-md bg-ink px-4 py-2 text-sm text-white shadow-lg"
      data-testid="undo-toast"
    >
      <span>{message}</span>
      <button
        type="button"
        onClick={onUndo}
        className="rounded border border-white/60 px-2 py-0.5 font-semibold hover:bg-white/10"
        data-testid="undo-button"
      >
        Undo
      </button>
      <span className="text-xs text-white/80">
        or <Kbd>u</Kbd>
      </span>
    </div>
  );
}
