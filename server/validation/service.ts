// Recall validation: a prevalence sample (how rich the collection is) and an elusion
// test (how many responsive documents the set not to be produced still holds), each a
// simple random sample with a recorded seed from the population it names, sized by
// n = z^2 p(1-p)/E^2 with the finite-population correction; statistics over the coded
// part: Clopper-Pearson exact interval and Wilson interval (server/engine/stats).
import { randomInt } from 'node:crypto';
import {
  elusionEstimate,
  sampleSize,
  simpleRandomSample,
  wilson,
  clopperPearson,
} from '../engine/index';
import type {
  CreateSampleResponse,
  SampleKind,
  SampleResponse,
  SamplesResponse,
} from '../../shared/schemas/validation';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { conflict, notFound } from '../http/errors';
import { relevanceCodes } from '../prioritised/queries';
import { createSampleBatch } from './batch';
import {
  documentsWithCode,
  findSample,
  listSamples,
  matterDocumentIds,
  sampleDocuments,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

export const POPULATION_RULES: Record<SampleKind, string> = {
  prevalence: 'every document of the matter',
  elusion: 'every document of the matter not coded Responsive (reviewed or not)',
};

export async function createSample(
  ctx: AppContext,
  matterId: number,
  input: { kind: SampleKind; confidence: number; margin: number; seed?: number },
  actor: Actor,
): Promise<CreateSampleResponse> {
  const codes = await relevanceCodes(ctx.db, matterId);
  if (codes.responsive === null || codes.notResponsive === null)
    throw conflict(
      'Validation reads codes named "Responsive" and "Not responsive" from the code set; add them first.',
    );
  const seed = input.seed ?? randomInt(0, 2 ** 32 - 1);
  const prepared = await ctx.db.transaction().execute(async (trx) => {
    const all = await matterDocumentIds(trx, matterId);
    const responsive = new Set(await documentsWithCode(trx, matterId, codes.responsive!));
    const population = input.kind === 'elusion' ? all.filter((id) => !responsive.has(id)) : all;
    if (population.length === 0)
      throw conflict(
        input.kind === 'elusion'
          ? 'Every document is coded Responsive: there is nothing left to sample for elusion.'
          : 'The matter has no documents to sample.',
      );
    const size = sampleSize({
      confidence: input.confidence,
      margin: input.margin,
      population: population.length,
    });
    const drawn = simpleRandomSample(population, size, seed);
    const createdAt = new Date().toISOString();
    const { id: sampleId } = await trx
      .insertInto('validation_samples')
      .values({
        matter_id: matterId,
        kind: input.kind,
        confidence: input.confidence,
        margin: input.margin,
        seed,
        population: population.length,
        population_rule: POPULATION_RULES[input.kind],
        size,
        produced: responsive.size,
        batch_id: null,
        created_by: actor.email,
        created_at: createdAt,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    for (let start = 0; start < drawn.length; start += 400) {
      await trx
        .insertInto('validation_sample_documents')
        .values(
          drawn.slice(start, start + 400).map((documentId, i) => ({
            sample_id: sampleId,
            document_id: documentId,
            position: start + i + 1,
          })),
        )
        .execute();
    }
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'validation.sample_created',
      targetType: 'validation_sample',
      targetId: sampleId,
      detail: {
        kind: input.kind,
        confidence: input.confidence,
        margin: input.margin,
        seed,
        population: population.length,
        populationRule: POPULATION_RULES[input.kind],
        size,
        produced: responsive.size,
      },
    });
    return { sampleId, size, population: population.length, drawn };
  });
  const batchId = await createSampleBatch(ctx, matterId, actor, {
    sampleId: prepared.sampleId,
    kind: input.kind,
    documentIds: prepared.drawn,
  });
  return {
    sampleId: prepared.sampleId,
    size: prepared.size,
    seed,
    population: prepared.population,
    batchId,
  };
}

export async function getSample(
  ctx: AppContext,
  matterId: number,
  sampleId: number,
): Promise<SampleResponse & { listing: Awaited<ReturnType<typeof sampleDocuments>> }> {
  // listing is documents' own rows (kept apart for the CSV).
  const sample = await findSample(ctx.db, matterId, sampleId);
  if (!sample) throw notFound('Sample');
  const codes = await relevanceCodes(ctx.db, matterId);
  const listing = await sampleDocuments(ctx.db, sampleId, codes);
  const coded = listing.filter((d) => d.coded).length;
  const responsive = listing.filter((d) => d.responsive).length;
  const base = {
    documents: listing,
    coded,
    size: sample.size,
    responsive,
    sampleId: sample.id,
    kind: sample.kind,
    confidence: sample.confidence,
    margin: sample.margin,
    seed: sample.seed,
    population: sample.population,
    populationRule: sample.population_rule,
    produced: sample.produced,
    batchId: sample.batch_id,
    createdAt: sample.created_at,
    createdBy: sample.created_by,
    listing,
  };
  if (coded === 0)
    return {
      ...base,
      rate: null,
      interval: null,
      wilson: null,
      estimatedMissed: null,
      recall: null,
      estimatedResponsive: null,
    };
  if (sample.kind === 'elusion') {
    const e = elusionEstimate(
      responsive,
      coded,
      sample.population,
      sample.produced,
      sample.confidence,
    );
    return {
      ...base,
      rate: e.rate,
      interval: { method: 'clopper-pearson', ...e.interval },
      wilson: e.wilson,
      estimatedMissed: e.estimatedMissed,
      recall: e.recall,
      estimatedResponsive: null,
    };
  }
  const interval = clopperPearson(responsive, coded, sample.confidence);
  return {
    ...base,
    rate: responsive / coded,
    interval: { method: 'clopper-pearson', ...interval },
    wilson: wilson(responsive, coded, sample.confidence),
    estimatedMissed: null,
    recall: null,
    estimatedResponsive: (responsive / coded) * sample.population,
  };
}

export async function samplesOf(ctx: AppContext, matterId: number): Promise<SamplesResponse> {
  const rows = await listSamples(ctx.db, matterId);
  return {
    samples: rows.map((r) => ({
      sampleId: r.id,
      kind: r.kind,
      size: r.size,
      seed: r.seed,
      population: r.population,
      confidence: r.confidence,
      margin: r.margin,
      createdAt: r.created_at,
    })),
  };
}

const pct = (v: number | null | undefined) => (v == null ? '' : (v * 100).toFixed(2) + '%');

/** The report as CSV: the figures, then one row per sampled document; audited. */
export async function sampleReportCsv(
  ctx: AppContext,
  matterId: number,
  sampleId: number,
  actor: Actor,
): Promise<{ filename: string; header: string[]; rows: (string | number)[][] }> {
  const s = await getSample(ctx, matterId, sampleId);
  const rows: (string | number)[][] = [
    ['summary', 'kind', s.kind, ''],
    ['summary', 'population', s.population, s.populationRule],
    ['summary', 'seed', s.seed, ''],
    ['summary', 'confidence', s.confidence, ''],
    ['summary', 'margin', s.margin, ''],
    ['summary', 'size', s.size, ''],
    ['summary', 'coded', s.coded, ''],
    ['summary', 'responsive', s.responsive, ''],
    ['summary', 'rate', pct(s.rate), ''],
    [
      'summary',
      'clopper-pearson',
      s.interval ? `${pct(s.interval.low)} to ${pct(s.interval.high)}` : '',
      '',
    ],
    ['summary', 'wilson', s.wilson ? `${pct(s.wilson.low)} to ${pct(s.wilson.high)}` : '', ''],
    [
      'summary',
      'estimated missed',
      s.estimatedMissed == null ? '' : s.estimatedMissed.toFixed(1),
      '',
    ],
    [
      'summary',
      'estimated responsive',
      s.estimatedResponsive == null ? '' : s.estimatedResponsive.toFixed(1),
      '',
    ],
    [
      'summary',
      'recall',
      s.recall ? `${pct(s.recall.point)} (${pct(s.recall.low)} to ${pct(s.recall.high)})` : '',
      s.recall ? `found = ${s.produced} coded Responsive when drawn` : '',
    ],
    ...s.listing.map((d, i) => [
      'document',
      i + 1,
      d.controlNumber,
      d.coded ? (d.responsive ? 'Responsive' : 'Not responsive') : 'not coded',
    ]),
  ];
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'validation.report_exported',
    targetType: 'validation_sample',
    targetId: sampleId,
    detail: { kind: s.kind, coded: s.coded, responsive: s.responsive },
  });
  return {
    filename: `validation-sample-${sampleId}.csv`,
    header: ['section', 'item', 'value', 'note'],
    rows,
  };
}

export async function recordReportViewed(
  ctx: AppContext,
  matterId: number,
  sampleId: number,
  actor: Actor,
) {
  const s = await findSample(ctx.db, matterId, sampleId);
  if (!s) throw notFound('Sample');
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'validation.report_viewed',
    targetType: 'validation_sample',
    targetId: sampleId,
    detail: { kind: s.kind },
  });
}
