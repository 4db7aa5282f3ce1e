import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { SampleKind } from '@shared/schemas/validation';
import { ReviewCaution } from '@/components/review-caution';
import {
  Button,
  EmptyState,
  ErrorPanel,
  Notice,
  QueryBoundary,
  Select,
  TBody,
  THead,
  Table,
  Td,
  Th,
  TextField,
  Tr,
} from '@/components/ui';
import { fieldErrorOf } from '@/lib/api-client';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { useCreateSample } from '../api/create-sample';
import { useSamples } from '../api/get-samples';

export const KIND_LABELS: Record<SampleKind, string> = {
  prevalence: 'Prevalence (whole collection)',
  elusion: 'Elusion (documents not coded Responsive)',
};

const CONFIDENCE = [
  { value: '0.9', label: '90%' },
  { value: '0.95', label: '95%' },
  { value: '0.99', label: '99%' },
];
const MARGINS = [
  { value: '0.01', label: '± 1%' },
  { value: '0.02', label: '± 2%' },
  { value: '0.025', label: '± 2.5%' },
  { value: '0.05', label: '± 5%' },
  { value: '0.1', label: '± 10%' },
];

export function ValidationSamples({ matterId }: { matterId: number }) {
  const canRun = useMatterPermission('validation.run');
  const samples = useSamples(matterId);
  const create = useCreateSample(matterId);
  const [kind, setKind] = useState<SampleKind>('elusion');
  const [confidence, setConfidence] = useState('0.95');
  const [margin, setMargin] = useState('0.05');
  const [seed, setSeed] = useState('');
  return (
    <div className="space-y-4" data-testid="validation-page">
      <ReviewCaution compact />
      <Notice tone="info">
        A prevalence sample at the start measures how rich the collection is; an elusion test at the
        end samples the documents the team will not produce. Each sample is a simple random sample
        with a recorded seed, sized by n = z²p(1−p)/E² with the finite-population correction. These
        statistics support, and do not replace, counsel’s certification; follow the ESI protocol.
      </Notice>
      {canRun ? (
        <form
          className="flex flex-wrap items-end gap-3"
          aria-label="Draw a validation sample"
          onSubmit={(event) => {
            event.preventDefault();
            create.mutate({
              kind,
              confidence: Number(confidence),
              margin: Number(margin),
              ...(seed.trim() !== '' ? { seed: Number(seed) } : {}),
            });
          }}
        >
          <Select
            label="Sample"
            className="w-80"
            value={kind}
            onChange={(e) => setKind(e.target.value as SampleKind)}
            options={(Object.keys(KIND_LABELS) as SampleKind[]).map((k) => ({
              value: k,
              label: KIND_LABELS[k],
            }))}
            data-testid="sample-kind"
          />
          <Select
            label="Confidence"
            className="w-28"
            value={confidence}
            onChange={(e) => setConfidence(e.target.value)}
            options={CONFIDENCE}
          />
          <Select
            label="Margin"
            className="w-28"
            value={margin}
            onChange={(e) => setMargin(e.target.value)}
            options={MARGINS}
          />
          <TextField
            label="Seed (optional)"
            className="w-40"
            inputMode="numeric"
            value={seed}
            onChange={(e) => setSeed(e.target.value)}
            error={fieldErrorOf(create.error, 'seed') ?? undefined}
          />
          <Button
            variant="primary"
            type="submit"
            disabled={create.isPending}
            data-testid="sample-create"
          >
            Draw sample
          </Button>
        </form>
      ) : null}
      {create.isError && !fieldErrorOf(create.error, 'seed') ? (
        <ErrorPanel error={create.error} title="The sample could not be drawn" />
      ) : null}
      {create.data ? (
        <Notice tone="info" title="Sample drawn" data-testid="sample-created">
          {create.data.size} documents from a population of{' '}
          {create.data.population.toLocaleString('en')}, seed {create.data.seed}.{' '}
          {create.data.batchId === null
            ? 'Review batches are not available on this server yet: code the documents from the report page.'
            : `Batch ${create.data.batchId} holds them for review.`}{' '}
          <Link
            className="text-accent-strong underline"
            to={`/matters/${matterId}/validation/${create.data.sampleId}`}
          >
            Open the report
          </Link>
        </Notice>
      ) : null}
      <QueryBoundary query={samples} errorTitle="The samples could not be loaded">
        {({ samples: list }) =>
          list.length === 0 ? (
            <EmptyState title="No validation sample yet" />
          ) : (
            <Table caption="Validation samples, newest first">
              <THead>
                <tr>
                  <Th>Sample</Th>
                  <Th>Drawn</Th>
                  <Th>Size</Th>
                  <Th>Population</Th>
                  <Th>Confidence, margin</Th>
                  <Th>Seed</Th>
                </tr>
              </THead>
              <TBody>
                {list.map((s) => (
                  <Tr key={s.sampleId} data-testid="sample-row">
                    <Td>
                      <Link
                        className="text-accent-strong underline"
                        to={`/matters/${matterId}/validation/${s.sampleId}`}
                      >
                        {KIND_LABELS[s.kind]} #{s.sampleId}
                      </Link>
                    </Td>
                    <Td>{formatDateTime(s.createdAt)}</Td>
                    <Td className="tabular-nums">{s.size}</Td>
                    <Td className="tabular-nums">{s.population.toLocaleString('en')}</Td>
                    <Td>
                      {Math.round(s.confidence * 1000) / 10}%, ± {Math.round(s.margin * 1000) / 10}%
                    </Td>
                    <Td className="tabular-nums">{s.seed}</Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          )
        }
      </QueryBoundary>
    </div>
  );
}
