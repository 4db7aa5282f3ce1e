import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { createProductionSchema, type Production } from '@shared/schemas/productions';
import { Button, Notice, Select, TextField, describeError } from '@/components/ui';
import { activeCodes, useCodes } from '@/features/codes/api/get-codes';
import { useSavedSearches } from '@/features/saved-searches/api/get-saved-searches';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { useCreateProduction } from '../api/create-production';

// The form's own shape: the shared request schema with the source as two plain fields,
// turned into { savedSearchId } or { codes, excludeCodes } on submit.
const formSchema = createProductionSchema.omit({ source: true, legendByCode: true }).extend({
  sourceKind: z.enum(['savedSearch', 'codes']),
  savedSearchId: z.string(),
  codes: z.array(z.string()),
  excludeCodes: z.array(z.string()),
  start: z.string().regex(/^\d*$/, 'must be a whole number'),
});
type FormValues = z.input<typeof formSchema>;

/** Fields whose server message shows under their own input; anything else shows below the form. */
const SHOWN_FIELDS = [
  'name',
  'source.savedSearchId',
  'bates.prefix',
  'bates.start',
  'bates.padding',
  'legend',
];
const fieldOfError = (error: unknown) => (isApiError(error) ? (error.field ?? '') : '');

export function ProductionForm({
  matterId,
  onCreated,
}: {
  matterId: number;
  onCreated: (production: Production) => void;
}) {
  const saved = useSavedSearches(matterId);
  const codes = useCodes(matterId);
  const create = useCreateProduction(matterId);
  const form = useForm<FormValues>({
    resolver: zodResolver(formSchema),
    defaultValues: {
      name: '',
      sourceKind: 'savedSearch',
      savedSearchId: '',
      codes: [],
      excludeCodes: [],
      bates: { prefix: '', padding: 7 },
      start: '',
      legend: 'CONFIDENTIAL',
      privileged: 'withhold',
      natives: 'unpaginated',
    },
  });
  const { register, handleSubmit, watch, formState } = form;
  const sourceKind = watch('sourceKind');
  const codeList = activeCodes(codes.data?.codes ?? []);

  const submit = handleSubmit(async (values) => {
    const source =
      values.sourceKind === 'savedSearch'
        ? { savedSearchId: Number(values.savedSearchId) }
        : { codes: values.codes.map(Number), excludeCodes: values.excludeCodes.map(Number) };
    const result = await create.mutateAsync({
      name: values.name,
      source,
      bates: {
        prefix: values.bates.prefix,
        padding: Number(values.bates.padding),
        ...(values.start ? { start: Number(values.start) } : {}),
      },
      legend: values.legend,
      privileged: values.privileged,
      natives: values.natives,
    });
    onCreated(result.production);
    form.reset();
  });

  const errorOf = (field: string, local?: { message?: string }) =>
    local?.message ?? fieldErrorOf(create.error, field);

  return (
    <form
      onSubmit={(e) => void submit(e)}
      className="space-y-4"
      data-testid="production-form"
      noValidate
    >
      <TextField
        label="Name"
        hint="How the team and the audit trail refer to this production."
        {...register('name')}
        error={errorOf('name', formState.errors.name)}
        data-testid="production-name"
      />
      <fieldset className="space-y-2">
        <legend className="text-[13px] font-medium text-ink">What goes into it</legend>
        <div className="flex gap-4 text-sm">
          <label className="flex items-center gap-1.5">
            <input type="radio" value="savedSearch" {...register('sourceKind')} /> A saved search
          </label>
          <label className="flex items-center gap-1.5">
            <input type="radio" value="codes" {...register('sourceKind')} /> Documents with codes
          </label>
        </div>
        {sourceKind === 'savedSearch' ? (
          <Select
            label="Saved search"
            options={[
              { value: '', label: 'Choose a saved search' },
              ...(saved.data?.savedSearches ?? []).map((s) => ({
                value: String(s.id),
                label: s.name,
              })),
            ]}
            {...register('savedSearchId')}
            error={errorOf('source.savedSearchId')}
            data-testid="production-saved-search"
          />
        ) : (
          <div className="grid gap-3 sm:grid-cols-2">
            {(['codes', 'excludeCodes'] as const).map((field) => (
              <fieldset key={field} className="rounded-md border border-line p-2">
                <legend className="px-1 text-[13px] text-ink-muted">
                  {field === 'codes' ? 'Carrying every one of' : 'And none of'}
                </legend>
                {codeList.map((c) => (
                  <label key={c.id} className="flex items-center gap-1.5 text-sm">
                    <input type="checkbox" value={String(c.id)} {...register(field)} /> {c.name}
                  </label>
                ))}
              </fieldset>
            ))}
          </div>
        )}
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField
          label="Bates prefix"
          hint="Letters, digits, - or _."
          {...register('bates.prefix')}
          error={errorOf('bates.prefix', formState.errors.bates?.prefix)}
          data-testid="production-prefix"
        />
        <TextField
          label="First number"
          hint="Empty: continue after the last number used."
          inputMode="numeric"
          {...register('start')}
          error={errorOf('bates.start', formState.errors.start)}
          data-testid="production-start"
        />
        <TextField
          label="Digits"
          type="number"
          min={1}
          max={12}
          {...register('bates.padding', { valueAsNumber: true })}
          error={errorOf('bates.padding', formState.errors.bates?.padding)}
        />
      </div>
      <TextField
        label="Legend on every page"
        hint="For example CONFIDENTIAL, as the protective order requires; empty for none."
        {...register('legend')}
        error={errorOf('legend', formState.errors.legend)}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <Select
          label="Privileged documents"
          options={[
            { value: 'withhold', label: 'Withhold behind a slip sheet' },
            { value: 'redact', label: 'Produce with their redactions burned in' },
          ]}
          {...register('privileged')}
        />
        <Select
          label="Native files"
          options={[
            { value: 'unpaginated', label: 'For files that do not paginate' },
            { value: 'all', label: 'For every produced document' },
            { value: 'none', label: 'None' },
          ]}
          {...register('natives')}
        />
      </div>
      <p className="text-xs text-ink-muted">
        A privileged document without redactions is withheld in either case.
      </p>
      {create.error && !SHOWN_FIELDS.includes(fieldOfError(create.error)) ? (
        <Notice tone="danger" title="The production could not be defined">
          {describeError(create.error)}
        </Notice>
      ) : null}
      <Button
        type="submit"
        variant="primary"
        busy={create.isPending}
        data-testid="production-create"
      >
        Define production
      </Button>
    </form>
  );
}
