import { useId, useState } from 'react';
import { Button, ErrorPanel, Notice, Select, SkeletonRows, describeError } from '@/components/ui';
import { inputBase } from '@/components/ui/text-field';
import { fieldErrorOf } from '@/lib/api-client';
import { Can } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { useCustodians } from '@/features/documents/api/get-custodians';
import { useHolds, type LegalHold } from '../api/get-holds';
import { useReleaseHold } from '../api/release-hold';
import { useSetHold } from '../api/set-hold';

const scopeOf = (hold: LegalHold) =>
  hold.custodian ? `Custodian ${hold.custodian.name}` : 'Whole matter';

/**
 * Legal holds on the matter: who and what they cover, and why. While one stands, none of
 * the documents it covers can be deleted. Leads set and release holds, each with a reason.
 */
export function HoldsPanel({ matterId }: { matterId: number }) {
  const holds = useHolds(matterId);
  const active = holds.data?.holds.filter((h) => h.active) ?? [];
  return (
    <section
      aria-labelledby="holds-heading"
      className="rounded-md border border-line bg-panel p-4"
      data-testid="holds-panel"
    >
      <h2 id="holds-heading" className="mb-3 text-sm font-semibold">
        Legal holds
      </h2>
      {holds.isPending ? (
        <SkeletonRows rows={2} label="Loading the legal holds" />
      ) : holds.isError ? (
        <ErrorPanel error={holds.error} title="The holds could not be loaded" />
      ) : (
        <div className="space-y-3">
          {active.length === 0 ? (
            <p className="text-[13px] text-ink-muted">No legal hold on this matter.</p>
          ) : (
            <ul className="space-y-2" aria-label="Active legal holds">
              {active.map((hold) => (
                <ActiveHold key={hold.id} matterId={matterId} hold={hold} />
              ))}
            </ul>
          )}
          <Can permission="holds.manage">
            <SetHoldForm matterId={matterId} />
          </Can>
        </div>
      )}
    </section>
  );
}

function ActiveHold({ matterId, hold }: { matterId: number; hold: LegalHold }) {
  const [releasing, setReleasing] = useState(false);
  const [reason, setReason] = useState('');
  const release = useReleaseHold(matterId);
  const reasonId = useId();
  return (
    <li
      className="rounded border border-warn/35 bg-warn-soft px-2.5 py-2 text-[13px]"
      data-testid="active-hold"
    >
      <p className="font-semibold text-warn">{scopeOf(hold)}</p>
      <p className="text-ink">{hold.reason}</p>
      <p className="text-xs text-ink-muted">
        Set {formatDateTime(hold.setAt)}
        {hold.setBy ? ` by ${hold.setBy}` : ''}
      </p>
      <Can permission="holds.manage">
        {releasing ? (
          <div className="mt-2 space-y-1.5">
            <label htmlFor={reasonId} className="block text-xs font-medium">
              Why is the hold released?
            </label>
            <textarea
              id={reasonId}
              rows={2}
              value={reason}
              onChange={(event) => setReason(event.target.value)}
              className={`${inputBase} px-2 py-1 text-[13px]`}
              data-testid="release-reason"
            />
            {release.isError ? (
              <p className="text-xs font-medium text-danger">
                {fieldErrorOf(release.error, 'reason') ?? describeError(release.error)}
              </p>
            ) : null}
            <div className="flex justify-end gap-1.5">
              <Button size="sm" onClick={() => setReleasing(false)}>
                Cancel
              </Button>
              <Button
                size="sm"
                variant="danger"
                busy={release.isPending}
                data-testid="confirm-release-hold"
                onClick={() => release.mutate({ holdId: hold.id, reason })}
              >
                Release hold
              </Button>
            </div>
          </div>
        ) : (
          <div className="mt-1.5 flex justify-end">
            <Button
              size="sm"
              variant="quiet"
              onClick={() => setReleasing(true)}
              data-testid="release-hold"
            >
              Release…
            </Button>
          </div>
        )}
      </Can>
    </li>
  );
}

function SetHoldForm({ matterId }: { matterId: number }) {
  const custodians = useCustodians(matterId);
  const setHold = useSetHold(matterId);
  const [scope, setScope] = useState('');
  const [reason, setReason] = useState('');
  const reasonId = useId();
  const options = [
    { value: '', label: 'The whole matter' },
    ...(custodians.data?.custodians ?? []).map((c) => ({
      value: String(c.id),
      label: `Custodian ${c.name}`,
    })),
  ];
  return (
    <form
      className="space-y-2 border-t border-line pt-3"
      aria-label="Set a legal hold"
      onSubmit={(event) => {
        event.preventDefault();
        setHold.mutate(
          { custodianId: scope ? Number(scope) : null, reason },
          { onSuccess: () => setReason('') },
        );
      }}
    >
      <Select
        label="Hold"
        options={options}
        value={scope}
        onChange={(event) => setScope(event.target.value)}
        data-testid="hold-scope"
      />
      <div className="space-y-1">
        <label htmlFor={reasonId} className="block text-[13px] font-medium text-ink">
          Reason (the hold notice or order)
        </label>
        <textarea
          id={reasonId}
          rows={2}
          value={reason}
          onChange={(event) => setReason(event.target.value)}
          className={`${inputBase} px-2.5 py-1.5 text-sm`}
          data-testid="hold-reason"
        />
      </div>
      {setHold.isError ? (
        <Notice tone="danger" title="The hold was not set">
          {fieldErrorOf(setHold.error, 'reason') ?? describeError(setHold.error)}
        </Notice>
      ) : null}
      <div className="flex justify-end">
        <Button type="submit" size="sm" busy={setHold.isPending} data-testid="set-hold">
          Set legal hold
        </Button>
      </div>
    </form>
  );
}
