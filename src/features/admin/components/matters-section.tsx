import { type FormEvent, useState } from 'react';
import { CONTROL_PREFIX_PATTERN, EMAIL_MAX_LENGTH, MATTER_NAME_MAX_LENGTH } from '@shared/limits';
import {
  Badge,
  Button,
  Dialog,
  EmptyState,
  Notice,
  QueryBoundary,
  TBody,
  THead,
  Table,
  Td,
  TextField,
  Th,
  Tr,
  describeError,
} from '@/components/ui';
import { useAppointLead } from '@/features/admin/api/appoint-lead';
import { useCreateMatter } from '@/features/admin/api/create-matter';
import { type AdminMatter, useAdminMatters } from '@/features/admin/api/get-admin-matters';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { formatDate } from '@/lib/format';

export function MattersSection() {
  const matters = useAdminMatters();
  const [creating, setCreating] = useState(false);
  const [appointing, setAppointing] = useState<AdminMatter | null>(null);
  return (
    <section aria-labelledby="admin-matters-heading">
      <div className="mb-2 flex items-center justify-between">
        <h2 id="admin-matters-heading" className="text-sm font-semibold">
          Matters
        </h2>
        <Button size="sm" variant="primary" onClick={() => setCreating(true)}>
          New matter
        </Button>
      </div>
      <QueryBoundary query={matters} errorTitle="Matters could not be loaded">
        {({ matters: list }) =>
          list.length === 0 ? (
            <EmptyState title="No matters yet" />
          ) : (
            <Table caption="All matters of the firm" data-testid="admin-matters-table">
              <THead>
                <tr>
                  <Th>Matter</Th>
                  <Th className="w-28">Prefix</Th>
                  <Th>Lead</Th>
                  <Th className="w-24">Members</Th>
                  <Th className="w-32">Opened</Th>
                  <Th className="w-36 text-right">
                    <span className="sr-only">Actions</span>
                  </Th>
                </tr>
              </THead>
              <TBody>
                {list.map((matter) => (
                  <Tr key={matter.id}>
                    <Td className="font-medium">{matter.name}</Td>
                    <Td className="font-mono text-[13px] text-ink-muted">{matter.controlPrefix}</Td>
                    <Td>
                      {matter.leads.length === 0 ? (
                        <Badge tone="warn">No lead</Badge>
                      ) : (
                        matter.leads.map((lead) => lead.name).join(', ')
                      )}
                    </Td>
                    <Td className="tabular-nums">{matter.memberCount}</Td>
                    <Td className="text-ink-muted">{formatDate(matter.createdAt)}</Td>
                    <Td className="text-right">
                      <Button size="sm" onClick={() => setAppointing(matter)}>
                        Appoint lead
                      </Button>
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          )
        }
      </QueryBoundary>
      <CreateMatterDialog open={creating} onClose={() => setCreating(false)} />
      <AppointLeadDialog matter={appointing} onClose={() => setAppointing(null)} />
    </section>
  );
}

function CreateMatterDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const create = useCreateMatter();
  const [name, setName] = useState('');
  const [description, setDescription] = useState('');
  const [controlPrefix, setPrefix] = useState('');
  const [leadEmail, setLeadEmail] = useState('');
  const prefixValid = CONTROL_PREFIX_PATTERN.test(controlPrefix);

  const close = () => {
    create.reset();
    setName('');
    setDescription('');
    setPrefix('');
    setLeadEmail('');
    onClose();
  };

  function submit(event: FormEvent) {
    event.preventDefault();
    create.mutate(
      {
        name: name.trim(),
        description: description.trim(),
        controlPrefix,
        lead: leadEmail.trim(),
      },
      { onSuccess: close },
    );
  }

  const error = create.error;
  return (
    <Dialog
      open={open}
      onClose={close}
      title="New matter"
      description="The control prefix starts every Bates-style control number of the matter's documents."
    >
      <form onSubmit={submit} className="space-y-3" noValidate>
        <TextField
          label="Name"
          required
          maxLength={MATTER_NAME_MAX_LENGTH}
          value={name}
          onChange={(e) => setName(e.target.value)}
          error={fieldErrorOf(error, 'name')}
        />
        <TextField
          label="Description"
          value={description}
          onChange={(e) => setDescription(e.target.value)}
          error={fieldErrorOf(error, 'description')}
        />
        <TextField
          label="Control prefix"
          hint="2–8 capital letters or digits, starting with a letter (e.g. HARB)."
          value={controlPrefix}
          onChange={(e) => setPrefix(e.target.value.toUpperCase())}
          error={
            controlPrefix && !prefixValid
              ? 'Use 2–8 capital letters or digits, starting with a letter.'
              : fieldErrorOf(error, 'controlPrefix')
          }
        />
        <TextField
          label="Lead's e-mail"
          hint="An existing account; it becomes the matter's first lead."
          required
          type="email"
          maxLength={EMAIL_MAX_LENGTH}
          value={leadEmail}
          onChange={(e) => setLeadEmail(e.target.value)}
          error={fieldErrorOf(error, 'lead')}
        />
        {error && !(isApiError(error) && error.field) ? (
          <Notice tone="danger">{describeError(error)}</Notice>
        ) : null}
        <div className="flex justify-end gap-2 pt-1">
          <Button onClick={close}>Cancel</Button>
          <Button
            type="submit"
            variant="primary"
            busy={create.isPending}
            disabled={!name.trim() || !prefixValid || !leadEmail.trim()}
          >
            Create matter
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function AppointLeadDialog({
  matter,
  onClose,
}: {
  matter: AdminMatter | null;
  onClose: () => void;
}) {
  const appoint = useAppointLead();
  const [email, setEmail] = useState('');
  const close = () => {
    appoint.reset();
    setEmail('');
    onClose();
  };
  function submit(event: FormEvent) {
    event.preventDefault();
    if (!matter) return;
    appoint.mutate({ matterId: matter.id, lead: email.trim() }, { onSuccess: close });
  }
  return (
    <Dialog
      open={matter !== null}
      onClose={close}
      title={matter ? `Appoint a lead for ${matter.name}` : 'Appoint lead'}
      description="The account becomes the matter's lead; it can then invite the team."
    >
      <form onSubmit={submit} className="space-y-3" noValidate>
        <TextField
          label="Account e-mail"
          type="email"
          required
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          error={fieldErrorOf(appoint.error, 'lead')}
        />
        {appoint.error && !(isApiError(appoint.error) && appoint.error.field) ? (
          <Notice tone="danger">{describeError(appoint.error)}</Notice>
        ) : null}
        <div className="flex justify-end gap-2 pt-1">
          <Button onClick={close}>Cancel</Button>
          <Button type="submit" variant="primary" busy={appoint.isPending} disabled={!email.trim()}>
            Appoint lead
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
