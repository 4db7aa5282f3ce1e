import { type FormEvent, useState } from 'react';
import {
  CODE_COLOURS,
  CODE_COLOUR_NAMES,
  type CodeColour,
  type CodeGroup,
  type CodeGroupKind,
} from '@shared/schemas/codes';
import { Button, Notice, describeError, inputClass } from '@/components/ui';
import { useCreateCodeGroup } from '../api/create-code-group';
import type { Code } from '../api/get-codes';
import { useUpdateCode } from '../api/update-code';
import { useUpdateCodeGroup } from '../api/update-code-group';
import { CodeChip } from './code-chip';

const KIND_LABELS: Record<CodeGroupKind, string> = {
  single: 'One choice',
  multi: 'Any number',
  privilege: 'Privilege (one choice, with type and basis)',
};

/**
 * The coding layout: groups with their rules (required before moving on; coding follows
 * the family and exact duplicates) and each code's group and colour. The lead edits it.
 */
export function CodeGroupsPanel({
  matterId,
  groups,
  codes,
  canManage,
}: {
  matterId: number;
  groups: CodeGroup[];
  codes: Code[];
  canManage: boolean;
}) {
  const updateGroup = useUpdateCodeGroup(matterId);
  const updateCode = useUpdateCode(matterId);
  const error = updateGroup.error ?? updateCode.error;
  return (
    <section className="mb-6" aria-labelledby="layout-heading" data-testid="code-groups">
      <h2 id="layout-heading" className="mb-2 text-base font-semibold">
        Coding layout
      </h2>
      {error ? (
        <Notice tone="danger" className="mb-2" title="Not changed">
          {describeError(error)}
        </Notice>
      ) : null}
      <div className="grid gap-3 md:grid-cols-2">
        {groups.map((group) => (
          <div
            key={group.id}
            className="rounded-md border border-line bg-panel p-3 text-[13px]"
            data-testid="code-group-card"
            data-group-name={group.name}
          >
            <p className="font-semibold">{group.name}</p>
            <p className="mb-2 text-xs text-ink-muted">{KIND_LABELS[group.kind]}</p>
            <div className="mb-2 flex flex-wrap gap-3">
              {(
                [
                  ['required', 'Required before moving on'],
                  ['followFamily', 'Follows the family'],
                  ['followDuplicates', 'Follows exact duplicates'],
                ] as const
              ).map(([field, label]) => (
                <label key={field} className="flex items-center gap-1.5">
                  <input
                    type="checkbox"
                    checked={group[field]}
                    disabled={!canManage || updateGroup.isPending}
                    onChange={(e) =>
                      updateGroup.mutate({
                        groupId: group.id,
                        changes: { [field]: e.target.checked },
                      })
                    }
                    data-testid={`group-${field}`}
                  />
                  {label}
                </label>
              ))}
            </div>
            <ul className="space-y-1">
              {codes
                .filter((c) => c.groupId === group.id && !c.archivedAt)
                .map((code) => (
                  <li key={code.id} className="flex items-center gap-2">
                    <CodeChip name={code.name} colour={code.colour} />
                    {canManage ? (
                      <select
                        aria-label={`Colour of ${code.name}`}
                        className={`${inputClass} h-7 w-28`}
                        value={code.colour}
                        onChange={(e) =>
                          updateCode.mutate({
                            codeId: code.id,
                            changes: { colour: e.target.value as CodeColour },
                          })
                        }
                      >
                        {CODE_COLOUR_NAMES.map((c) => (
                          <option key={c} value={c}>
                            {CODE_COLOURS[c].label}
                          </option>
                        ))}
                      </select>
                    ) : null}
                    {canManage && group.kind !== 'privilege' ? (
                      <select
                        aria-label={`Group of ${code.name}`}
                        className={`${inputClass} h-7 w-36`}
                        value={group.id}
                        onChange={(e) =>
                          updateCode.mutate({
                            codeId: code.id,
                            changes: { groupId: Number(e.target.value) },
                          })
                        }
                      >
                        {groups
                          .filter((g) => g.kind !== 'privilege')
                          .map((g) => (
                            <option key={g.id} value={g.id}>
                              {g.name}
                            </option>
                          ))}
                      </select>
                    ) : null}
                  </li>
                ))}
            </ul>
          </div>
        ))}
      </div>
      {canManage ? <NewGroup matterId={matterId} /> : null}
    </section>
  );
}

function NewGroup({ matterId }: { matterId: number }) {
  const create = useCreateCodeGroup(matterId);
  const [name, setName] = useState('');
  const [kind, setKind] = useState<CodeGroupKind>('multi');
  function submit(event: FormEvent) {
    event.preventDefault();
    create.mutate({ name: name.trim(), kind }, { onSuccess: () => setName('') });
  }
  return (
    <form onSubmit={submit} className="mt-3 flex flex-wrap items-end gap-2 text-[13px]">
      <label>
        <span className="text-ink-muted">New group</span>
        <input
          className={inputClass}
          value={name}
          onChange={(e) => setName(e.target.value)}
          maxLength={60}
          placeholder="e.g. Confidentiality"
        />
      </label>
      <label>
        <span className="text-ink-muted">Kind</span>
        <select
          className={inputClass}
          value={kind}
          onChange={(e) => setKind(e.target.value as CodeGroupKind)}
        >
          <option value="multi">Any number</option>
          <option value="single">One choice</option>
        </select>
      </label>
      <Button type="submit" disabled={!name.trim() || create.isPending}>
        Add group
      </Button>
      {create.isError ? <span className="text-danger">{describeError(create.error)}</span> : null}
    </form>
  );
}
