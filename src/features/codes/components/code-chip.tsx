import { CODE_COLOURS, type CodeColour } from '@shared/schemas/codes';
import { cn } from '@/lib/cn';

/** A code as a coloured chip (palette pairs meet WCAG AA, code-colours.test.ts). */
export function CodeChip({
  name,
  colour,
  className,
}: {
  name: string;
  colour: CodeColour | undefined;
  className?: string;
}) {
  const pair = CODE_COLOURS[colour ?? 'slate'] ?? CODE_COLOURS.slate;
  return (
    <span
      className={cn(
        'inline-flex items-center rounded-full px-2 py-0.5 text-[11px] font-semibold whitespace-nowrap',
        className,
      )}
      style={{ backgroundColor: pair.bg, color: pair.fg }}
      data-testid="code-chip"
    >
      {name}
    </span>
  );
}
