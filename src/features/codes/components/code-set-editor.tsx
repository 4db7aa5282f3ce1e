import { type FormEvent, useState } from 'react';
import { CODE_NAME_MAX_LENGTH, type UpdateCodeReq } from '@shared/schemas/codes';
import { Badge, Button, Notice, TextField, describeError } from '@/components/ui';
import { inputClass } from '@/components/ui/text-field';
import { cn } from '@/lib/cn';
import { RESERVED_KEYS, codeKeyMap, keyOfCode } from '@/features/review';
import { useCreateCode } from '../api/create-code';
import { type Code, activeCodes } from '../api/get-codes';
import { useUpdateCode } from '../api/update-code';

/** Checks a shortcut typed by the lead before the server sees it. */
export function shortcutProblem(value: string, codes: Code[], selfId?: number): string | null {
  if (value === '') return null;
  if (!/^[a-z0-9]$/.test(value)) return 'One lower-case letter or digit.';
  if ((RESERVED_KEYS as readonly string[]).includes(value))
    return `“${value}” moves between documents or opens a panel in the viewer.`;
  const taken = codes.find(
    (code) => code.shortcut === value && code.id !== selfId && !code.archivedAt,
  );
  return taken ? `“${value}” already applies ${taken.name}.` : null;
}

/** The matter's code set: everyone sees it; the lead (codes.manage) edits it. */
export function CodeSetEditor({
  matterId,
  codes,
  canManage,
}: {
  matterId: number;
  codes: Code[];
  canManage: boolean;
}) {
  const active = activeCodes(codes);
  const keyMap = codeKeyMap(active);
  const archived = codes.filter((code) => code.archivedAt !== null);
  const update = useUpdateCode(matterId);
  return (
    <div className="space-y-4">
      {update.isError ? (
        <Notice tone="danger" title="The code was not changed">
          {describeError(update.error)}
        </Notice>
      ) : null}
      <div className="overflow-x-auto rounded-md border border-line bg-panel">
        <table className="w-full border-collapse text-[13px]" data-testid="code-set">
          <caption className="sr-only">Codes of this matter</caption>
          <thead className="bg-sunk/70 text-left text-[11px] tracking-wide text-ink-muted uppercase">
            <tr>
              <th scope="col" className="px-3 py-1.5">
                Code
              </th>
              <th scope="col" className="w-28 px-3 py-1.5">
                Viewer key
              </th>
              <th scope="col" className="w-32 px-3 py-1.5">
                Privilege log
              </th>
              <th scope="col" className="w-24 px-3 py-1.5 text-right">
                Documents
              </th>
              {canManage ? (
                <th scope="col" className="w-[19rem] px-3 py-1.5 text-right">
                  Change
                </th>
              ) : null}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {[...active, ...archived].map((code, index) => (
              <CodeRow
                key={code.id}
                code={code}
                codes={codes}
                viewerKey={code.archivedAt ? undefined : keyOfCode(keyMap, code.id)}
                canManage={canManage}
                first={index === 0}
                last={index === active.length - 1}
                onChange={(changes) => update.mutate({ codeId: code.id, changes })}
                onMove={(direction) => {
                  const neighbour = active[index + direction];
                  if (!neighbour) return;
                  update.mutate({ codeId: code.id, changes: { sortOrder: neighbour.sortOrder } });
                  update.mutate({ codeId: neighbour.id, changes: { sortOrder: code.sortOrder } });
                }}
                busy={update.isPending && update.variables.codeId === code.id}
              />
            ))}
          </tbody>
        </table>
      </div>
      {canManage ? <AddCode matterId={matterId} codes={codes} /> : null}
    </div>
  );
}

function CodeRow({
  code,
  codes,
  viewerKey,
  canManage,
  first,
  last,
  onChange,
  onMove,
  busy,
}: {
  code: Code;
  codes: Code[];
  viewerKey: string | undefined;
  canManage: boolean;
  first: boolean;
  last: boolean;
  onChange: (changes: UpdateCodeReq) => void;
  onMove: (direction: -1 | 1) => void;
  busy: boolean;
}) {
  const [editing, setEditing] = useState(false);
  const [name, setName] = useState(code.name);
  const [shortcut, setShortcut] = useState(code.shortcut ?? '');
  const problem = shortcutProblem(shortcut, codes, code.id);
  const archived = code.archivedAt !== null;

  function save(event: FormEvent) {
    event.preventDefault();
    if (problem || !name.trim()) return;
    const changes: UpdateCodeReq = {};
    if (name.trim() !== code.name) changes.name = name.trim();
    if ((shortcut || null) !== code.shortcut) changes.shortcut = shortcut || null;
    if (Object.keys(changes).length > 0) onChange(changes);
    setEditing(false);
  }

  return (
    <tr
      className={cn(archived && 'text-ink-muted')}
      data-testid="code-row"
      data-code-name={code.name}
    >
      <td className="px-3 py-1.5">
        {editing ? (
          <form id={`code-${code.id}`} onSubmit={save} className="flex gap-2">
            <input
              aria-label={`New name for ${code.name}`}
              className={cn(inputClass, 'h-7')}
              value={name}
              maxLength={CODE_NAME_MAX_LENGTH}
              onChange={(event) => setName(event.target.value)}
              autoFocus
            />
          </form>
        ) : (
          <span className="font-medium">{code.name}</span>
        )}
        {archived ? <Badge className="ml-2">Archived</Badge> : null}
      </td>
      <td className="px-3 py-1.5">
        {editing ? (
          <div>
            <input
              form={`code-${code.id}`}
              aria-label={`Shortcut key for ${code.name}`}
              className={cn(inputClass, 'h-7 w-14 font-mono')}
              value={shortcut}
              maxLength={1}
              onChange={(event) => setShortcut(event.target.value.toLowerCase())}
            />
            {problem ? <p className="mt-0.5 text-xs text-danger">{problem}</p> : null}
          </div>
        ) : viewerKey ? (
          <kbd className="rounded border border-line-strong bg-panel px-1.5 font-mono">
            {viewerKey}
          </kbd>
        ) : (
          '—'
        )}
      </td>
      <td className="px-3 py-1.5">{code.marksPrivileged ? 'Yes' : 'No'}</td>
      <td className="px-3 py-1.5 text-right tabular-nums">{code.documentCount}</td>
      {canManage ? (
        <td className="px-3 py-1.5 text-right whitespace-nowrap">
          {editing ? (
            <span className="inline-flex gap-1">
              <Button
                size="sm"
                type="submit"
                form={`code-${code.id}`}
                variant="primary"
                disabled={Boolean(problem) || !name.trim()}
              >
                Save
              </Button>
              <Button
                size="sm"
                variant="quiet"
                onClick={() => {
                  setEditing(false);
                  setName(code.name);
                  setShortcut(code.shortcut ?? '');
                }}
              >
                Cancel
              </Button>
            </span>
          ) : archived ? (
            <Button
              size="sm"
              variant="quiet"
              busy={busy}
              onClick={() => onChange({ archived: false })}
            >
              Restore
            </Button>
          ) : (
            <span className="inline-flex gap-1">
              <Button
                size="sm"
                variant="quiet"
                aria-label={`Move ${code.name} up`}
                disabled={first}
                onClick={() => onMove(-1)}
              >
                ↑
              </Button>
              <Button
                size="sm"
                variant="quiet"
                aria-label={`Move ${code.name} down`}
                disabled={last}
                onClick={() => onMove(1)}
              >
                ↓
              </Button>
              <Button
                size="sm"
                variant="quiet"
                onClick={() => setEditing(true)}
                data-testid="code-edit"
              >
                Rename or re-key
              </Button>
              <Button
                size="sm"
                variant="quiet"
                className="text-danger hover:bg-danger-soft"
                busy={busy}
                onClick={() => onChange({ archived: true })}
                data-testid="code-archive"
              >
                Archive
              </Button>
            </span>
          )}
        </td>
      ) : null}
    </tr>
  );
}

function AddCode({ matterId, codes }: { matterId: number; codes: Code[] }) {
  const create = useCreateCode(matterId);
  const [name, setName] = useState('');
  const [shortcut, setShortcut] = useState('');
  const [marksPrivileged, setMarksPrivileged] = useState(false);
  const problem = shortcutProblem(shortcut, codes);

  function submit(event: FormEvent) {
    event.preventDefault();
    if (problem) return;
    create.mutate(
      { name: name.trim(), shortcut: shortcut || null, marksPrivileged },
      {
        onSuccess: () => {
          setName('');
          setShortcut('');
          setMarksPrivileged(false);
        },
      },
    );
  }

  return (
    <form
      onSubmit={submit}
      className="rounded-md border border-line bg-panel p-3"
      aria-label="Add a code"
      data-testid="code-add"
    >
      <h2 className="mb-2 text-sm font-semibold">Add a code</h2>
      <div className="flex flex-wrap items-end gap-3">
        <TextField
          label="Name"
          className="w-64"
          value={name}
          maxLength={CODE_NAME_MAX_LENGTH}
          onChange={(event) => setName(event.target.value)}
          required
        />
        <TextField
          label="Viewer key"
          hint="Optional"
          className="w-28"
          value={shortcut}
          maxLength={1}
          error={problem}
          onChange={(event) => setShortcut(event.target.value.toLowerCase())}
        />
        <label className="flex h-9 items-center gap-2 text-[13px]">
          <input
            type="checkbox"
            className="size-4 accent-accent"
            checked={marksPrivileged}
            onChange={(event) => setMarksPrivileged(event.target.checked)}
          />
          Goes on the privilege log
        </label>
        <Button
          type="submit"
          variant="primary"
          busy={create.isPending}
          disabled={!name.trim() || Boolean(problem)}
        >
          Add code
        </Button>
      </div>
      {create.isError ? (
        <Notice tone="danger" className="mt-2" title="The code was not added">
          {describeError(create.error)}
        </Notice>
      ) : null}
    </form>
  );
}
