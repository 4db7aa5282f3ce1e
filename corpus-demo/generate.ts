// Generates the demo matter's corpus: a few hundred documents of an invented commercial
// dispute in mixed formats, with exact duplicates and deliberately broken files, plus a
// manifest.json describing every file. Deterministic: a seeded PRNG and fixed dates,
// so two runs produce identical bytes.
//
//   npm run demo:corpus [-- --out <dir>]
import { createHash } from 'node:crypto';
import { mkdir, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { NOISE, TOPICS, type TopicContent, type TopicId } from './content';
import {
  makeDocx,
  makeEml,
  makeHtml,
  makeImageOnlyPdf,
  makePdf,
  makeText,
  type Attachment,
} from './render';
import { BRACKENFIELD, HARROWGATE, MATTER, PEOPLE, type Person, type PersonKey } from './scenario';
import { DEMO_QUERIES, TARGETS, type DemoQuery, type TargetDocument } from './targets';

export const MANIFEST_VERSION = 1;
const SEED = 0x5eaf2021;

export type DocumentFormat = 'pdf' | 'docx' | 'eml' | 'txt' | 'html' | 'md' | 'dwg';

/** One file of the corpus as listed in manifest.json. */
export interface ManifestFile {
  /** 1-based position in load order (files sorted by path). */
  order: number;
  /** Path relative to the corpus folder, always with forward slashes. */
  path: string;
  /** Custodian slug (the first folder of the path). */
  custodian: string;
  format: DocumentFormat;
  topics: TopicId[];
  title: string;
  /** ISO 8601 date the document was written or sent. */
  date: string;
  bytes: number;
  sha256: string;
  /** Character encoding of a text file when it is not UTF-8. */
  encoding?: 'latin1' | 'utf16le';
  /** Path of the first copy when this file is a byte-for-byte duplicate. */
  duplicateOf?: string;
  /** Why extraction should fail or yield no text, for the deliberately broken files. */
  brokenReason?: string;
  /** Attachments carried inside an e-mail. */
  attachments?: { filename: string; format: DocumentFormat; topics: TopicId[] }[];
  /** True for the hand-written documents the demo queries should find. */
  demoTarget?: boolean;
}

/** The manifest written beside the corpus as manifest.json. */
export interface DemoCorpusManifest {
  version: number;
  matter: { name: string; caption: string; summary: string };
  custodians: { slug: string; name: string; title: string; organisation: string; email: string }[];
  topics: { id: TopicId; label: string; description: string }[];
  documentCount: number;
  files: ManifestFile[];
  demoQueries: (DemoQuery & { expectedOrder: number[] })[];
}

/** A planned document: its manifest fields, its indexable text and how to render it. */
export interface PlannedDocument {
  path: string;
  custodian: string;
  format: DocumentFormat;
  topics: TopicId[];
  title: string;
  date: Date;
  /** The text a correct extractor should recover (empty for broken files). */
  text: string;
  encoding?: 'latin1' | 'utf16le';
  duplicateOf?: string;
  brokenReason?: string;
  attachments?: { filename: string; format: DocumentFormat; topics: TopicId[] }[];
  demoTarget?: boolean;
  render: () => Promise<Buffer>;
}

// ---------------------------------------------------------------------------------------
// Deterministic randomness: mulberry32 (a well-known 32-bit PRNG; common practice).

export class Rng {
  private state: number;
  constructor(seed: number) {
    this.state = seed >>> 0;
  }
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }
  int(min: number, max: number): number {
    return min + Math.floor(this.next() * (max - min + 1));
  }
  pick<T>(items: readonly T[]): T {
    return items[Math.floor(this.next() * items.length)];
  }
  chance(probability: number): boolean {
    return this.next() < probability;
  }
  /** `count` distinct items in random order. */
  sample<T>(items: readonly T[], count: number): T[] {
    const pool = [...items];
    const out: T[] = [];
    while (out.length < count && pool.length > 0)
      out.push(pool.splice(Math.floor(this.next() * pool.length), 1)[0]);
    return out;
  }
  bytes(length: number): Buffer {
    const out = Buffer.alloc(length);
    for (let i = 0; i < length; i += 1) out[i] = Math.floor(this.next() * 256);
    return out;
  }
}

// ---------------------------------------------------------------------------------------
// Who writes about what, and when.

interface TopicCast {
  holders: PersonKey[];
  correspondents: PersonKey[];
  from: string;
  to: string;
  count: number;
}

const CAST: Record<TopicId, TopicCast> = {
  termination: {
    holders: ['daria', 'simon', 'hollis', 'malcolm', 'edwina'],
    correspondents: ['nadia', 'bernard', 'lena'],
    from: '2021-01-11',
    to: '2021-06-30',
    count: 22,
  },
  quality: {
    holders: ['hollis', 'rafe', 'priya', 'simon', 'malcolm'],
    correspondents: ['tobias', 'marcus'],
    from: '2020-08-03',
    to: '2021-03-12',
    count: 22,
  },
  rebates: {
    holders: ['edwina', 'simon', 'malcolm', 'daria'],
    correspondents: ['bernard'],
    from: '2019-06-03',
    to: '2021-05-28',
    count: 22,
  },
  recruitment: {
    holders: ['rafe', 'malcolm', 'priya'],
    correspondents: ['fenella', 'corin', 'tobias'],
    from: '2021-01-05',
    to: '2021-05-28',
    count: 22,
  },
  records: {
    holders: ['priya', 'lena', 'malcolm', 'rafe'],
    correspondents: ['jed', 'tobias', 'nadia'],
    from: '2021-03-15',
    to: '2021-06-18',
    count: 22,
  },
  concealment: {
    holders: ['geoffrey', 'malcolm', 'lena', 'edwina'],
    correspondents: ['bernard'],
    from: '2021-03-22',
    to: '2021-06-11',
    count: 22,
  },
};

/** Second topics that plausibly share a document with the first. */
const RELATED: Record<TopicId, TopicId[]> = {
  termination: ['quality', 'recruitment'],
  quality: ['termination', 'records'],
  rebates: ['concealment', 'termination'],
  recruitment: ['termination', 'records'],
  records: ['concealment', 'quality'],
  concealment: ['rebates', 'records'],
};

const NOISE_COUNT = 150;
const CUSTODIANS = (Object.keys(PEOPLE) as PersonKey[]).filter((key) => PEOPLE[key].custodian);
/** Who sends office notices, by organisation (notices stay inside their company). */
const NOISE_SENDERS: Record<string, PersonKey[]> = {
  [HARROWGATE]: ['orla', 'fenella', 'jed', 'bernard'],
  [BRACKENFIELD]: ['marcus'],
};
/** Share of topic documents that carry one bridge paragraph. */
const BRIDGE_RATE = 0.5;
const WEEKDAYS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday'];
const ORDINALS = ['third', 'fourth', 'fifth', 'sixth', 'seventh'];

const person = (key: PersonKey): Person => PEOPLE[key];
const dayMs = 86_400_000;

/** A working-hours instant between two ISO dates, on a weekday. */
function randomDate(rng: Rng, from: string, to: string): Date {
  const start = Date.parse(`${from}T00:00:00Z`);
  const days = Math.round((Date.parse(`${to}T00:00:00Z`) - start) / dayMs);
  let date = new Date(start + rng.int(0, days) * dayMs);
  while (date.getUTCDay() === 0 || date.getUTCDay() === 6) date = new Date(date.getTime() + dayMs);
  return new Date(date.getTime() + rng.int(7 * 60, 19 * 60) * 60_000);
}

const longDate = (date: Date): string =>
  date.toLocaleDateString('en-GB', {
    day: 'numeric',
    month: 'long',
    year: 'numeric',
    timeZone: 'UTC',
  });
const isoDay = (date: Date): string => date.toISOString().slice(0, 10);
const slugify = (text: string): string =>
  text
    .toLowerCase()
    .replace(/&/g, 'and')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '')
    .slice(0, 48)
    .replace(/-$/, '');

interface FillContext {
  to: string;
  from: string;
}

/** Expands `[a|b]` alternatives and `{slot}` values in a template. */
function fillTemplate(rng: Rng, template: string, context: FillContext): string {
  const chosen = template.replace(/\[([^\]]+)\]/g, (_match, options: string) =>
    rng.pick(options.split('|')),
  );
  return chosen.replace(/\{(\w+)\}/g, (match, slot: string) => {
    switch (slot) {
      case 'to':
        return context.to;
      case 'from':
        return context.from;
      case 'bb':
        return BRACKENFIELD;
      case 'hm':
        return HARROWGATE;
      case 'site':
        return 'Dunsford';
      case 'lot':
        return `HM-${rng.int(4300, 4790)}`;
      case 'ncr':
        return `NCR-2020-${String(rng.int(88, 160)).padStart(3, '0')}`;
      case 'tonnes':
        return String(rng.int(16, 28));
      case 'count':
        return rng.pick(ORDINALS);
      case 'amount':
        return `£${rng.int(11, 19)},${rng.pick(['250', '400', '750', '900', '100'])}`;
      case 'price':
        return String(rng.int(268, 312));
      case 'q':
        return String(rng.int(1, 4));
      case 'weekday':
        return rng.pick(WEEKDAYS);
      default:
        throw new Error(`content template uses unknown slot ${match}`);
    }
  });
}

const signature = (who: Person): string => `${who.name}\n${who.title}\n${who.organisation}`;
const addressOf = (recipient: PersonKey | string): string =>
  recipient in PEOPLE
    ? `"${person(recipient as PersonKey).name}" <${person(recipient as PersonKey).email}>`
    : recipient;
const nameOf = (recipient: PersonKey | string): string =>
  recipient in PEOPLE ? person(recipient as PersonKey).name : recipient;

function memoHeader(title: string, from: Person, to: Person, date: Date, kind: string): string[] {
  return [
    kind,
    `To: ${to.name}, ${to.title}\nFrom: ${from.name}, ${from.title}\nDate: ${longDate(date)}\nSubject: ${title}`,
  ];
}

/** Keeps paths unique by suffixing -2, -3, ... */
class PathRegistry {
  private used = new Set<string>();
  claim(folder: string, date: Date, title: string, ext: string): string {
    const base = `${folder}/${isoDay(date)}-${slugify(title) || 'untitled'}`;
    let candidate = `${base}.${ext}`;
    for (let n = 2; this.used.has(candidate); n += 1) candidate = `${base}-${n}.${ext}`;
    this.used.add(candidate);
    return candidate;
  }
  reserve(fixed: string): void {
    if (this.used.has(fixed)) throw new Error(`demo corpus path used twice: ${fixed}`);
    this.used.add(fixed);
  }
}

// ---------------------------------------------------------------------------------------
// Planning.

interface AttachmentPlan {
  filename: string;
  contentType: string;
  format: DocumentFormat;
  topics: TopicId[];
  text: string;
  render: () => Promise<Buffer>;
}

const CONTENT_TYPES = {
  pdf: 'application/pdf',
  docx: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
  txt: 'text/plain; charset=utf-8',
} as const;

interface FormalDoc {
  title: string;
  paragraphs: string[];
  author: Person;
  recipient: Person;
}

function pickTopicParagraphs(
  rng: Rng,
  topic: TopicContent,
  register: 'formal' | 'chatty',
  count: number,
  ctx: FillContext,
): string[] {
  return rng.sample(topic[register], count).map((template) => fillTemplate(rng, template, ctx));
}

function planFormal(
  rng: Rng,
  topic: TopicContent,
  author: Person,
  recipient: Person,
  extra?: TopicContent,
): FormalDoc {
  const ctx = { to: recipient.first, from: author.first };
  const title = fillTemplate(rng, rng.pick(topic.subjects), ctx).replace(/^Re: /, '');
  const paragraphs = pickTopicParagraphs(rng, topic, 'formal', rng.int(3, 5), ctx);
  if (rng.chance(BRIDGE_RATE)) {
    paragraphs.splice(
      rng.int(0, paragraphs.length),
      0,
      fillTemplate(rng, rng.pick(topic.bridgeFormal), ctx),
    );
  }
  if (extra)
    paragraphs.splice(
      rng.int(1, paragraphs.length),
      0,
      fillTemplate(rng, rng.pick(extra.formal), ctx),
    );
  return { title, paragraphs, author, recipient };
}

function otherPerson(rng: Rng, holder: PersonKey, cast: TopicCast): PersonKey {
  const pool = [...cast.holders, ...cast.correspondents].filter((key) => key !== holder);
  return rng.pick(pool);
}

const topicById = (id: TopicId): TopicContent => {
  const found = TOPICS.find((topic) => topic.id === id);
  if (!found) throw new Error(`unknown topic ${id}`);
  return found;
};

function formalAsFile(
  rng: Rng,
  doc: FormalDoc,
  date: Date,
  format: 'pdf' | 'docx' | 'txt' | 'html',
): { text: string; render: () => Promise<Buffer> } {
  const kind = rng.pick(['MEMORANDUM', 'FILE NOTE', 'BRIEFING NOTE', 'PRIVATE AND CONFIDENTIAL']);
  const header = memoHeader(doc.title, doc.author, doc.recipient, date, kind);
  const body = [...header, ...doc.paragraphs];
  const text = [doc.title, ...body].join('\n\n');
  switch (format) {
    case 'pdf': {
      const pages =
        body.length > 5
          ? [body.slice(0, 4).join('\n\n'), body.slice(4).join('\n\n')]
          : [body.join('\n\n')];
      return {
        text,
        render: () =>
          makePdf({ title: doc.title, author: doc.author.name, pages, createdAt: date }),
      };
    }
    case 'docx':
      return {
        text,
        render: () =>
          makeDocx({
            title: doc.title,
            author: doc.author.name,
            paragraphs: body,
            createdAt: date,
          }),
      };
    case 'html': {
      const includeScript = rng.chance(0.5);
      return {
        text,
        render: async () => makeHtml({ title: doc.title, bodyParagraphs: body, includeScript }),
      };
    }
    case 'txt':
      return { text, render: async () => makeText(`${doc.title}\n\n${body.join('\n\n')}\n`) };
  }
}

/** Plans every document of the corpus, with its text; nothing is rendered or written. */
export function planDemoCorpus(): PlannedDocument[] {
  const rng = new Rng(SEED);
  const paths = new PathRegistry();
  const docs: PlannedDocument[] = [];
  for (const target of TARGETS) paths.reserve(target.path);

  // Topic documents, formal and chatty.
  for (const topic of TOPICS) {
    const cast = CAST[topic.id];
    for (let i = 0; i < cast.count; i += 1) {
      const holderKey = cast.holders[i % cast.holders.length];
      const holder = person(holderKey);
      const otherKey = otherPerson(rng, holderKey, cast);
      const other = person(otherKey);
      const date = randomDate(rng, cast.from, cast.to);
      const extra = rng.chance(0.22) ? topicById(rng.pick(RELATED[topic.id])) : undefined;
      const topics: TopicId[] = extra ? [topic.id, extra.id] : [topic.id];
      const register = rng.chance(0.5) ? 'formal' : 'chatty';

      if (register === 'formal') {
        const authoredByHolder = rng.chance(0.6);
        const doc = planFormal(
          rng,
          topic,
          authoredByHolder ? holder : other,
          authoredByHolder ? other : holder,
          extra,
        );
        const format = rng.pick(['pdf', 'pdf', 'docx', 'docx', 'html', 'txt'] as const);
        const file = formalAsFile(rng, doc, date, format);
        docs.push({
          path: paths.claim(`${holder.slug}/documents`, date, doc.title, format),
          custodian: holder.slug,
          format,
          topics,
          title: doc.title,
          date,
          text: file.text,
          render: file.render,
        });
        continue;
      }

      const sent = rng.chance(0.6);
      const from = sent ? holder : other;
      const to = sent ? other : holder;
      const ctx = { to: to.first, from: from.first };
      const subjectBase = fillTemplate(rng, rng.pick(topic.subjects), ctx);
      const subject =
        rng.chance(0.35) && !subjectBase.startsWith('Re: ') ? `Re: ${subjectBase}` : subjectBase;
      const paragraphs = pickTopicParagraphs(rng, topic, 'chatty', rng.int(2, 3), ctx);
      if (rng.chance(BRIDGE_RATE))
        paragraphs.push(fillTemplate(rng, rng.pick(topic.bridgeChatty), ctx));
      if (extra) paragraphs.push(fillTemplate(rng, rng.pick(extra.chatty), ctx));
      if (rng.chance(0.3)) paragraphs.push(fillTemplate(rng, rng.pick(topic.formal), ctx));
      const format = rng.pick([
        'eml',
        'eml',
        'eml',
        'eml',
        'eml',
        'eml',
        'eml',
        'txt',
        'md',
      ] as const);

      if (format === 'eml') {
        const greeting = rng.pick([`${to.first},`, `Hi ${to.first},`, `Dear ${to.first},`, '']);
        const signOff = rng.pick([
          from.first,
          `Thanks,\n${from.first}`,
          `Best,\n${from.first}`,
          signature(from),
        ]);
        const attachmentPlans: AttachmentPlan[] = [];
        if (rng.chance(0.3)) {
          const attached = planFormal(rng, topic, from, to);
          const attachmentFormat = rng.pick(['pdf', 'docx', 'txt'] as const);
          const file = formalAsFile(rng, attached, date, attachmentFormat);
          attachmentPlans.push({
            filename: `${slugify(attached.title)}.${attachmentFormat}`,
            contentType: CONTENT_TYPES[attachmentFormat],
            format: attachmentFormat,
            topics: [topic.id],
            text: file.text,
            render: file.render,
          });
        }
        const bodyText = [greeting, ...paragraphs, signOff].filter(Boolean).join('\n\n') + '\n';
        const cc = rng.chance(0.2)
          ? [person(otherPerson(rng, holderKey, cast))].filter((p) => p !== from && p !== to)
          : [];
        const emlPath = paths.claim(
          `${holder.slug}/mail`,
          date,
          subject.replace(/^Re: /, 're-'),
          'eml',
        );
        const text = [
          subject,
          `From: ${from.name}\nTo: ${to.name}${cc.length ? `\nCc: ${cc.map((p) => p.name).join(', ')}` : ''}`,
          bodyText,
          ...attachmentPlans.map((plan) => plan.text),
        ].join('\n\n');
        docs.push({
          path: emlPath,
          custodian: holder.slug,
          format: 'eml',
          topics,
          title: subject,
          date,
          text,
          attachments: attachmentPlans.map(
            ({ filename, format: attachmentFormat, topics: attachmentTopics }) => ({
              filename,
              format: attachmentFormat,
              topics: attachmentTopics,
            }),
          ),
          render: async () => {
            const attachments: Attachment[] = [];
            for (const plan of attachmentPlans) {
              attachments.push({
                filename: plan.filename,
                contentType: plan.contentType,
                content: await plan.render(),
              });
            }
            return makeEml({
              from: addressOf(from === holder ? holderKey : otherKey),
              to: [addressOf(to === holder ? holderKey : otherKey)],
              cc: cc.map((p) => `"${p.name}" <${p.email}>`),
              subject,
              date,
              text: bodyText,
              attachments,
            });
          },
        });
      } else if (format === 'txt') {
        // A chat export: alternating speakers, one paragraph each.
        const lines = paragraphs.map((paragraph, index) => {
          const speaker = index % 2 === 0 ? from : to;
          const stamp = new Date(date.getTime() + index * 4 * 60_000).toISOString().slice(11, 16);
          return `[${isoDay(date)} ${stamp}] ${speaker.name}: ${paragraph}`;
        });
        const title = `Chat: ${from.first} and ${to.first}`;
        const body = `${title}\n\n${lines.join('\n')}\n`;
        docs.push({
          path: paths.claim(
            `${holder.slug}/documents`,
            date,
            `chat-${to.first}-${from.first}`,
            'txt',
          ),
          custodian: holder.slug,
          format: 'txt',
          topics,
          title,
          date,
          text: body,
          render: async () => makeText(body),
        });
      } else {
        const title = `Notes: ${subject.replace(/^Re: /, '')}`;
        const body = `# ${title}\n\n_${longDate(date)}, ${holder.name}_\n\n${paragraphs.map((p) => `- ${p}`).join('\n')}\n`;
        docs.push({
          path: paths.claim(`${holder.slug}/documents`, date, title, 'md'),
          custodian: holder.slug,
          format: 'md',
          topics,
          title,
          date,
          text: body,
          render: async () => makeText(body),
        });
      }
    }
  }

  // Background noise: notices and office chatter.
  for (let i = 0; i < NOISE_COUNT; i += 1) {
    const group = rng.pick(NOISE);
    const holderKey = CUSTODIANS[i % CUSTODIANS.length];
    const holder = person(holderKey);
    const sender = person(rng.pick(NOISE_SENDERS[holder.organisation]));
    const date = randomDate(rng, '2019-06-03', '2021-06-30');
    const title = rng.pick(group.subjects);
    const paragraphs = rng.sample(group.paragraphs, rng.int(1, group.paragraphs.length));
    const format = rng.pick([
      'eml',
      'eml',
      'eml',
      'eml',
      'eml',
      'html',
      'html',
      'txt',
      'txt',
      'docx',
      'pdf',
    ] as const);
    const base = { custodian: holder.slug, topics: [] as TopicId[], title, date };
    if (format === 'eml') {
      const bodyText =
        [`${rng.pick(['Hi all,', 'All,', 'Dear colleagues,'])}`, ...paragraphs, sender.first].join(
          '\n\n',
        ) + '\n';
      docs.push({
        ...base,
        path: paths.claim(`${holder.slug}/mail`, date, title, 'eml'),
        format,
        text: [title, `From: ${sender.name}\nTo: ${holder.name}`, bodyText].join('\n\n'),
        render: () =>
          makeEml({
            from: `"${sender.name}" <${sender.email}>`,
            to: [`"${holder.name}" <${holder.email}>`],
            subject: title,
            date,
            text: bodyText,
          }),
      });
    } else if (format === 'html') {
      const includeScript = rng.chance(0.6);
      docs.push({
        ...base,
        path: paths.claim(`${holder.slug}/documents`, date, `intranet-${title}`, 'html'),
        format,
        text: [title, ...paragraphs].join('\n\n'),
        render: async () => makeHtml({ title, bodyParagraphs: paragraphs, includeScript }),
      });
    } else if (format === 'txt') {
      // Some older notices were saved by a Windows tool in Latin-1 or UTF-16.
      const encoding = rng.pick(['utf8', 'utf8', 'latin1', 'utf16le'] as const);
      const body = `${title}\n\n${paragraphs.join('\n\n')}\n\nQueries to ${sender.name} (café extension 2214), cost centre £-coded.\n`;
      docs.push({
        ...base,
        path: paths.claim(`${holder.slug}/documents`, date, title, 'txt'),
        format,
        text: body,
        ...(encoding === 'utf8' ? {} : { encoding }),
        render: async () => makeText(body, { encoding }),
      });
    } else if (format === 'docx') {
      docs.push({
        ...base,
        path: paths.claim(`${holder.slug}/documents`, date, title, 'docx'),
        format,
        text: [title, title, ...paragraphs].join('\n\n'),
        render: () => makeDocx({ title, author: sender.name, paragraphs, createdAt: date }),
      });
    } else {
      docs.push({
        ...base,
        path: paths.claim(`${holder.slug}/documents`, date, title, 'pdf'),
        format,
        text: [title, ...paragraphs].join('\n\n'),
        render: () =>
          makePdf({
            title,
            author: sender.name,
            pages: [paragraphs.join('\n\n')],
            createdAt: date,
          }),
      });
    }
  }

  // Hand-written key documents.
  for (const target of TARGETS) docs.push(planTarget(target));

  // The signed Master Supply Agreement (a long formal document everyone has a copy of).
  const agreementDate = new Date('2017-03-01T10:00:00Z');
  const agreementPages = masterSupplyAgreementPages();
  docs.push({
    path: 'daria-petrakis/documents/2017-03-01-master-supply-agreement.pdf',
    custodian: PEOPLE.daria.slug,
    format: 'pdf',
    topics: ['termination', 'quality', 'rebates'],
    title: 'Master Supply Agreement',
    date: agreementDate,
    text: ['Master Supply Agreement', ...agreementPages].join('\n\n'),
    render: () =>
      makePdf({
        title: 'Master Supply Agreement',
        author: PEOPLE.daria.name,
        pages: agreementPages,
        createdAt: agreementDate,
      }),
  });

  addDuplicates(rng, docs);
  addBrokenFiles(rng, docs);
  return docs.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
}

function planTarget(target: TargetDocument): PlannedDocument {
  const date = new Date(target.date);
  const holder = person(target.custodian);
  const base = {
    path: target.path,
    custodian: holder.slug,
    format: target.format,
    topics: target.topics,
    title: target.title,
    date,
    demoTarget: true,
  };
  switch (target.format) {
    case 'eml': {
      if (!target.from || !target.to)
        throw new Error(`target e-mail ${target.path} needs from and to`);
      const from = person(target.from);
      const to = target.to;
      const bodyText = target.paragraphs.join('\n\n') + '\n';
      return {
        ...base,
        text: [target.title, `From: ${from.name}\nTo: ${to.map(nameOf).join(', ')}`, bodyText].join(
          '\n\n',
        ),
        render: () =>
          makeEml({
            from: addressOf(target.from as PersonKey),
            to: to.map(addressOf),
            subject: target.title,
            date,
            text: bodyText,
          }),
      };
    }
    case 'pdf':
      return {
        ...base,
        text: [target.title, ...target.paragraphs].join('\n\n'),
        render: () =>
          makePdf({
            title: target.title,
            author: holder.name,
            pages: [target.paragraphs.join('\n\n')],
            createdAt: date,
          }),
      };
    case 'docx':
      return {
        ...base,
        text: [target.title, ...target.paragraphs].join('\n\n'),
        render: () =>
          makeDocx({
            title: target.title,
            author: holder.name,
            paragraphs: target.paragraphs,
            createdAt: date,
          }),
      };
    case 'txt': {
      const body = `${target.paragraphs.join('\n\n')}\n`;
      return { ...base, text: body, render: async () => makeText(body) };
    }
    case 'md': {
      const body = `# ${target.title}\n\n${target.paragraphs.join('\n\n')}\n`;
      return { ...base, text: body, render: async () => makeText(body) };
    }
  }
}

function masterSupplyAgreementPages(): string[] {
  return [
    `THIS AGREEMENT is made on 1 March 2017 between ${HARROWGATE}, whose registered office is at Kestrel Lane Mill, Harrowgate (the "Supplier"), and ${BRACKENFIELD}, whose registered office is at Dunsford (the "Customer").\n\n1. Supply. The Supplier shall mill and deliver to the Customer's Dunsford bakery the flour blends described in Schedule 1, in the quantities called off by the Customer from time to time.\n\n2. Term. This Agreement starts on 1 March 2017 and continues for five years unless terminated earlier under clause 14.`,
    '5. Specification. Every delivery shall conform to the Specification in Schedule 2, including moisture not exceeding 14.5 per cent, freedom from insects, foreign matter and metal, and the sieve and magnet checks there described. The Customer may reject any delivery that does not conform.\n\n6. Minimum purchase. The Customer shall purchase not less than 40,000 tonnes in each contract year.\n\n7. Price and rebate. Prices are set out in Schedule 3. A volume rebate of one per cent of invoiced value is payable annually by credit note. No other discount, rebate or payment shall be made to the Customer or its employees.',
    '12. Records. The Supplier shall keep complete laboratory, cleaning and testing records for each lot for not less than three years and shall make them available to the Customer on request.\n\n14. Termination. 14.1 Either party may terminate this Agreement on twelve months written notice. 14.2 Either party may terminate this Agreement with immediate effect by written notice if the other commits a material breach that is not remedied within thirty days of written notice requiring it to be remedied.\n\n15. Anti-bribery. Each party shall comply with applicable anti-bribery law and shall not offer or give any payment, gift or advantage to an employee of the other to induce or reward the award or continuation of business.\n\nSigned for the Supplier by Malcolm Thorne, Managing Director. Signed for the Customer by the Chief Operating Officer.',
  ];
}

/** Exact copies: e-mails kept by both correspondents, and documents saved by two custodians. */
function addDuplicates(rng: Rng, docs: PlannedDocument[]): void {
  const copyTo = (original: PlannedDocument, custodian: Person): void => {
    const folder = original.path.split('/')[1];
    const fileName = original.path.split('/').slice(2).join('/');
    docs.push({
      ...original,
      path: `${custodian.slug}/${folder}/${fileName}`,
      custodian: custodian.slug,
      demoTarget: undefined,
      duplicateOf: original.path,
    });
  };
  // The agreement sits in several custodians' folders.
  const agreement = docs.find((doc) => doc.path.endsWith('master-supply-agreement.pdf'));
  if (agreement)
    for (const key of ['malcolm', 'edwina', 'simon'] as const) copyTo(agreement, person(key));
  // The Chairman's "Thursday" e-mail, as received by Malcolm.
  const thursday = docs.find((doc) => doc.path === 'geoffrey-ashby/mail/2021-04-19-thursday.eml');
  if (thursday) copyTo(thursday, person('malcolm'));
  // Topic documents saved by a second custodian.
  const candidates = docs.filter(
    (doc) => doc.topics.length > 0 && !doc.demoTarget && !doc.duplicateOf,
  );
  for (const original of rng.sample(candidates, 10)) {
    const others = CUSTODIANS.map(person).filter((p) => p.slug !== original.custodian);
    const custodian = rng.pick(others);
    const fileName = original.path.split('/').slice(2).join('/');
    if (
      docs.some(
        (doc) => doc.path === `${custodian.slug}/${original.path.split('/')[1]}/${fileName}`,
      )
    )
      continue;
    copyTo(original, custodian);
  }
}

/** Files that a careful extractor must refuse or flag, each with the reason. */
function addBrokenFiles(rng: Rng, docs: PlannedDocument[]): void {
  const broken = (
    filePath: string,
    format: DocumentFormat,
    title: string,
    date: string,
    brokenReason: string,
    render: () => Promise<Buffer>,
    topics: TopicId[] = [],
  ): PlannedDocument => ({
    path: filePath,
    custodian: filePath.split('/')[0],
    format,
    topics,
    title,
    date: new Date(date),
    text: '',
    brokenReason,
    render,
  });
  const auditPages = [
    'Laboratory audit summary, Kestrel Lane, February 2021. Sifter screens, magnets and pest-control points inspected.',
    'Findings and actions continue on the following pages.',
  ];
  const randomBytes = rng.bytes(4096);
  const cadBytes = Buffer.concat([Buffer.from('AC1032', 'latin1'), rng.bytes(6144)]);
  docs.push(
    broken(
      'rafe-dunmore/documents/2021-02-15-laboratory-audit-summary.pdf',
      'pdf',
      'Laboratory audit summary (truncated copy)',
      '2021-02-15T10:00:00Z',
      'truncated PDF: the file stops part-way through, with no cross-reference table, trailer or %%EOF marker',
      async () => {
        const full = await makePdf({
          title: 'Laboratory audit summary',
          author: PEOPLE.rafe.name,
          pages: auditPages,
        });
        return full.subarray(0, Math.floor(full.length * 0.45));
      },
      ['quality'],
    ),
    broken(
      'priya-halvorsen/documents/scan-0042.pdf',
      'pdf',
      'scan-0042',
      '2021-03-31T12:00:00Z',
      'not a PDF: random bytes with no %PDF- header, named .pdf',
      async () => randomBytes,
    ),
    broken(
      'edwina-calloway/documents/2020-12-31-pricing-schedule-protected.pdf',
      'pdf',
      'Pricing schedule 2021 (password protected)',
      '2020-12-31T16:00:00Z',
      'encrypted PDF: opening it needs the user password (PDF standard security handler); there is no text without it',
      () =>
        makePdf({
          title: 'Pricing schedule 2021',
          author: PEOPLE.edwina.name,
          pages: [
            'Premium blends at £296 per tonne; loyalty credit one and a half per cent, settled through the usual route.',
          ],
          createdAt: new Date('2020-12-31T16:00:00Z'),
          userPassword: 'harvest-2021',
        }),
      ['rebates'],
    ),
    broken(
      'daria-petrakis/documents/2021-03-10-briefing-for-the-board.docx',
      'docx',
      'Briefing for the board',
      '2021-03-10T09:00:00Z',
      'not a DOCX: plain text renamed .docx, not a ZIP (OOXML) package',
      async () =>
        makeText(
          'Briefing for the board (draft). This file was saved from a text editor and renamed; it is not a Word document.\n',
        ),
    ),
    broken(
      'simon-carrow/documents/2021-02-01-notes.txt',
      'txt',
      'notes',
      '2021-02-01T09:00:00Z',
      'empty file: zero bytes, nothing to extract',
      async () => Buffer.alloc(0),
    ),
    broken(
      'hollis-wren/documents/2020-11-20-signed-delivery-note-scan.pdf',
      'pdf',
      'Signed delivery note (scan)',
      '2020-11-20T08:30:00Z',
      'image-only PDF: a scanned page with no text layer; it needs OCR before it can be searched',
      () => makeImageOnlyPdf(new Date('2020-11-20T08:30:00Z')),
      ['quality'],
    ),
    broken(
      'priya-halvorsen/documents/kestrel-lane-sifter-layout.dwg',
      'dwg',
      'Kestrel Lane sifter layout',
      '2019-09-12T14:00:00Z',
      'unsupported type: a CAD drawing (binary), not a document format the extractor reads',
      async () => cadBytes,
    ),
  );
}

// ---------------------------------------------------------------------------------------
// Writing.

const sha256 = (data: Buffer): string => createHash('sha256').update(data).digest('hex');

/** Generates the corpus into `outDir` (replacing what is there) and returns its manifest. */
export async function generateDemoCorpus(outDir: string): Promise<DemoCorpusManifest> {
  const planned = planDemoCorpus();
  await rm(outDir, { recursive: true, force: true });
  await mkdir(outDir, { recursive: true });
  const rendered = new Map<string, Buffer>();
  for (const doc of planned) if (!doc.duplicateOf) rendered.set(doc.path, await doc.render());
  const files: ManifestFile[] = [];
  for (const [index, doc] of planned.entries()) {
    // Duplicates reuse the original's bytes, so they are identical by construction.
    const bytes = rendered.get(doc.duplicateOf ?? doc.path);
    if (!bytes)
      throw new Error(
        `duplicate ${doc.path} refers to ${doc.duplicateOf}, which is not in the corpus`,
      );
    const target = path.join(outDir, ...doc.path.split('/'));
    await mkdir(path.dirname(target), { recursive: true });
    await writeFile(target, bytes);
    files.push({
      order: index + 1,
      path: doc.path,
      custodian: doc.custodian,
      format: doc.format,
      topics: doc.topics,
      title: doc.title,
      date: doc.date.toISOString(),
      bytes: bytes.length,
      sha256: sha256(bytes),
      ...(doc.encoding ? { encoding: doc.encoding } : {}),
      ...(doc.duplicateOf ? { duplicateOf: doc.duplicateOf } : {}),
      ...(doc.brokenReason ? { brokenReason: doc.brokenReason } : {}),
      ...(doc.attachments && doc.attachments.length > 0 ? { attachments: doc.attachments } : {}),
      ...(doc.demoTarget ? { demoTarget: true } : {}),
    });
  }
  const orderOf = new Map(files.map((file) => [file.path, file.order]));
  const manifest: DemoCorpusManifest = {
    version: MANIFEST_VERSION,
    matter: { ...MATTER },
    custodians: CUSTODIANS.map(person).map(({ slug, name, title, organisation, email }) => ({
      slug,
      name,
      title,
      organisation,
      email,
    })),
    topics: TOPICS.map(({ id, label, description }) => ({ id, label, description })),
    documentCount: files.length,
    files,
    demoQueries: DEMO_QUERIES.map((query) => ({
      ...query,
      expectedOrder: query.expected.map((expectedPath) => {
        const order = orderOf.get(expectedPath);
        if (order === undefined)
          throw new Error(`demo query "${query.query}" expects missing file ${expectedPath}`);
        return order;
      }),
    })),
  };
  await writeFile(path.join(outDir, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`);
  return manifest;
}

/** Where `npm run demo:corpus` writes by default. */
export const DEFAULT_OUT_DIR = path.join(path.dirname(fileURLToPath(import.meta.url)), 'out');

async function main(argv: string[]): Promise<void> {
  const outFlag = argv.indexOf('--out');
  if (outFlag !== -1 && !argv[outFlag + 1])
    throw new Error('--out needs a folder, e.g. --out /tmp/quarry-demo');
  const outDir = path.resolve(outFlag === -1 ? DEFAULT_OUT_DIR : argv[outFlag + 1]);
  const started = performance.now();
  const manifest = await generateDemoCorpus(outDir);
  const seconds = ((performance.now() - started) / 1000).toFixed(1);
  const broken = manifest.files.filter((file) => file.brokenReason).length;
  const duplicates = manifest.files.filter((file) => file.duplicateOf).length;
  console.log(
    `Wrote ${manifest.documentCount} files (${duplicates} duplicates, ${broken} broken) for ${manifest.custodians.length} custodians to ${outDir} in ${seconds}s`,
  );
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main(process.argv.slice(2)).catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 1;
  });
}
