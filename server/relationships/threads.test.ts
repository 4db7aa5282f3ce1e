// Threads from a hand-made set of messages: References and In-Reply-To (RFC 5322 §3.6.4),
// the subject-plus-participants fallback, and inclusive flags worked out by hand below.
import { describe, expect, it } from 'vitest';
import { buildThreads, normaliseSubject, type ThreadMessage } from './threads';

const alice = 'alice@bakery.example';
const bob = 'bob@mill.example';
const carol = 'carol@mill.example';

function msg(partial: Partial<ThreadMessage> & { id: number; sentAt: string }): ThreadMessage {
  return {
    messageId: null,
    inReplyTo: null,
    references: [],
    subject: 'Delivery schedule',
    participants: [alice, bob],
    body: '',
    attachments: [],
    ...partial,
  };
}

const messages: ThreadMessage[] = [
  msg({
    id: 1,
    messageId: '<a@x>',
    sentAt: '2022-01-03T09:00:00Z',
    body: 'Can you deliver on Tuesday?',
  }),
  // B answers A: In-Reply-To and References both name A; B quotes A.
  msg({
    id: 2,
    messageId: '<b@x>',
    inReplyTo: '<a@x>',
    references: ['<a@x>'],
    subject: 'Re: Delivery schedule',
    sentAt: '2022-01-03T10:00:00Z',
    body: 'Yes, Tuesday works.\n\n> Can you deliver on Tuesday?',
  }),
  // C answers B with References only (no In-Reply-To): the last known id is its parent.
  msg({
    id: 3,
    messageId: '<c@x>',
    references: ['<a@x>', '<b@x>'],
    subject: 'RE: Re: Delivery schedule',
    sentAt: '2022-01-03T11:00:00Z',
    body: 'Great, see you then.\n> Yes, Tuesday works.\n>\n> > Can you deliver on Tuesday?',
  }),
  // D branches from A without quoting it.
  msg({
    id: 4,
    messageId: '<d@x>',
    inReplyTo: '<a@x>',
    subject: 'Re: Delivery schedule',
    sentAt: '2022-01-03T12:00:00Z',
    body: 'Actually, make it Wednesday.',
  }),
  // E has no threading headers (a client that dropped them): subject + participants place it
  // under the latest earlier message with the same key (D), which it quotes.
  msg({
    id: 5,
    subject: 'Fwd: RE: Delivery schedule',
    sentAt: '2022-01-03T13:00:00Z',
    body: 'Wednesday is fine.\n> Actually, make it Wednesday.',
  }),
  // Same subject without a reply prefix and no headers: a new conversation, not joined.
  msg({ id: 6, sentAt: '2022-01-10T09:00:00Z', body: 'New week, new schedule.' }),
  // Same reply subject but other participants: not the same conversation.
  msg({
    id: 7,
    subject: 'Re: Delivery schedule',
    participants: [carol, bob],
    sentAt: '2022-01-03T14:00:00Z',
    body: 'Internal note.',
  }),
  // G carries an attachment; H quotes G's text but not the attachment: G stays inclusive.
  msg({
    id: 8,
    messageId: '<g@x>',
    subject: 'Price list',
    sentAt: '2022-02-01T09:00:00Z',
    body: 'Prices attached.',
    attachments: ['sha-of-prices.xlsx'],
  }),
  msg({
    id: 9,
    messageId: '<h@x>',
    inReplyTo: '<g@x>',
    references: ['<g@x>'],
    subject: 'Re: Price list',
    sentAt: '2022-02-01T10:00:00Z',
    body: 'Thanks.\n> Prices attached.',
  }),
];

describe('buildThreads', () => {
  const placed = new Map(buildThreads(messages).map((p) => [p.id, p]));

  it('places replies under their parents from In-Reply-To, References and the subject fallback', () => {
    const parents = Object.fromEntries([...placed].map(([id, p]) => [id, p.parentId]));
    expect(parents).toEqual({ 1: null, 2: 1, 3: 2, 4: 1, 5: 4, 6: null, 7: null, 8: null, 9: 8 });
    const threads = Object.fromEntries([...placed].map(([id, p]) => [id, p.threadId]));
    expect(threads).toEqual({ 1: 1, 2: 1, 3: 1, 4: 1, 5: 1, 6: 6, 7: 7, 8: 8, 9: 8 });
  });

  it('marks inclusive messages: not contained (text and attachments) in a later reply of the branch', () => {
    // By hand: A is quoted by B (and C); B by C; D by E; C, E, 6, 7 and H are leaves; G's
    // attachment is not in H.
    const inclusive = Object.fromEntries([...placed].map(([id, p]) => [id, p.inclusive]));
    expect(inclusive).toEqual({
      1: false,
      2: false,
      3: true,
      4: false,
      5: true,
      6: true,
      7: true,
      8: true,
      9: true,
    });
  });

  it('a cycle of References (hostile or broken headers) does not loop or lose a message', () => {
    const cyclic = buildThreads([
      msg({ id: 1, messageId: '<p@x>', inReplyTo: '<q@x>', sentAt: '2022-01-01T00:00:00Z' }),
      msg({ id: 2, messageId: '<q@x>', inReplyTo: '<p@x>', sentAt: '2022-01-02T00:00:00Z' }),
    ]);
    // One link of the cycle is dropped: both messages in one thread with exactly one root.
    expect(new Set(cyclic.map((p) => p.threadId)).size).toBe(1);
    expect(cyclic.filter((p) => p.parentId === null)).toHaveLength(1);
  });

  it('normalises reply and forward prefixes, repeated and counted', () => {
    expect(normaliseSubject('RE: Fwd: re[2]:  Delivery   Schedule')).toEqual({
      base: 'delivery schedule',
      reply: true,
    });
    expect(normaliseSubject('Delivery schedule')).toEqual({
      base: 'delivery schedule',
      reply: false,
    });
  });
});
