// E-mail threads. RFC 5322 §3.6.4: a reply's In-Reply-To holds its parent's Message-ID and
// its References hold the parent's References followed by the parent's Message-ID, so the
// nearest known id (In-Reply-To, else References from the last id back) is the parent.
// Messages whose headers name no known parent fall back to the normalised subject (reply
// and forward prefixes removed) plus the participants: a message whose subject carries a
// reply/forward prefix joins the latest earlier message with the same key.
// Inclusive messages: a message is inclusive unless a later message of its branch (a
// descendant in the tree) contains its whole text, quote markers and spacing aside, and
// every one of its attachments (common practice in e-mail review: reading the inclusive
// messages covers every message's text and attachments).

export interface ThreadMessage {
  id: number;
  messageId: string | null;
  inReplyTo: string | null;
  /** Message ids in References order (oldest first). */
  references: string[];
  subject: string;
  /** Addresses of From, To and Cc. */
  participants: string[];
  sentAt: string | null;
  body: string;
  /** Identities of attachments (e.g. SHA-256 of each), to tell whether a reply kept them. */
  attachments: string[];
}

export interface ThreadPlacement {
  id: number;
  threadId: number;
  parentId: number | null;
  inclusive: boolean;
}

// Common reply/forward prefixes (English and a few European mail clients): Re, Fw, Fwd,
// Aw, Wg, Sv, Vs, Antw, Tr; with an optional count "Re[2]:".
const PREFIX = /^\s*(re|fwd?|aw|wg|sv|vs|antw|tr)\s*(\[\d+\])?\s*:\s*/i;

export function normaliseSubject(subject: string): { base: string; reply: boolean } {
  let text = subject;
  let reply = false;
  for (;;) {
    const stripped = text.replace(PREFIX, '').replace(/^\s*\[[^\]]*\]\s*(?=(re|fwd?)\s*:)/i, '');
    if (stripped === text) break;
    reply = true;
    text = stripped;
  }
  return { base: text.replace(/\s+/g, ' ').trim().toLowerCase(), reply };
}

/** Addresses (the part in angle brackets, or the whole item) of display text "A <a@x>, b@y". */
export function addressesOf(display: string): string[] {
  return (display.match(/[^\s<>,;"]+@[^\s<>,;"]+/g) ?? []).map((a) => a.toLowerCase());
}

/** Text compared for containment: quote markers, spacing and case aside. */
export function comparable(text: string): string {
  return text
    .replace(/^[ \t]*(>[ \t]?)+/gm, '')
    .replace(/\s+/g, ' ')
    .trim()
    .toLowerCase();
}

const time = (m: ThreadMessage) => (m.sentAt ? Date.parse(m.sentAt) : Number.POSITIVE_INFINITY);
const chronological = (a: ThreadMessage, b: ThreadMessage) => time(a) - time(b) || a.id - b.id;

export function buildThreads(messages: ThreadMessage[]): ThreadPlacement[] {
  const sorted = [...messages].sort(chronological);
  const byMessageId = new Map<string, ThreadMessage>();
  for (const m of sorted)
    if (m.messageId && !byMessageId.has(m.messageId)) byMessageId.set(m.messageId, m);
  const parent = new Map<number, number | null>();
  const ancestorOf = (id: number, candidate: number): boolean => {
    // True when `candidate` is `id` or one of its descendants would be its ancestor (cycle).
    let cursor: number | null | undefined = candidate;
    const seen = new Set<number>();
    while (cursor !== null && cursor !== undefined && !seen.has(cursor)) {
      if (cursor === id) return true;
      seen.add(cursor);
      cursor = parent.get(cursor);
    }
    return false;
  };
  for (const m of sorted) {
    const ids = [m.inReplyTo, ...[...m.references].reverse()].filter(Boolean) as string[];
    let found: number | null = null;
    for (const ref of ids) {
      const target = byMessageId.get(ref);
      if (target && target.id !== m.id && !ancestorOf(m.id, target.id)) {
        found = target.id;
        break;
      }
    }
    parent.set(m.id, found);
  }
  // Fallback for messages the headers do not place: subject plus participants.
  const keyOf = (m: ThreadMessage) => {
    const { base } = normaliseSubject(m.subject);
    return `${base}\u0000${[...new Set(m.participants.map((p) => p.toLowerCase()))].sort().join(',')}`;
  };
  const latestByKey = new Map<string, ThreadMessage>();
  for (const m of sorted) {
    const key = keyOf(m);
    const { base, reply } = normaliseSubject(m.subject);
    if (parent.get(m.id) === null && reply && base !== '') {
      const previous = latestByKey.get(key);
      if (previous && !ancestorOf(m.id, previous.id)) parent.set(m.id, previous.id);
    }
    latestByKey.set(key, m);
  }
  const rootOf = (id: number): number => {
    let cursor = id;
    for (let p = parent.get(cursor); p !== null && p !== undefined; p = parent.get(cursor))
      cursor = p;
    return cursor;
  };
  const children = new Map<number, number[]>();
  for (const [id, p] of parent) {
    if (p === null || p === undefined) continue;
    const list = children.get(p);
    if (list) list.push(id);
    else children.set(p, [id]);
  }
  const byId = new Map(messages.map((m) => [m.id, m]));
  const text = new Map(messages.map((m) => [m.id, comparable(m.body)]));
  const contains = (later: ThreadMessage, earlier: ThreadMessage) => {
    const own = text.get(earlier.id)!;
    if (own !== '' && !text.get(later.id)!.includes(own)) return false;
    const kept = new Set(later.attachments);
    return earlier.attachments.every((a) => kept.has(a));
  };
  const descendants = (id: number): number[] => {
    const out: number[] = [];
    const stack = [...(children.get(id) ?? [])];
    while (stack.length) {
      const next = stack.pop()!;
      out.push(next);
      stack.push(...(children.get(next) ?? []));
    }
    return out;
  };
  return messages.map((m) => ({
    id: m.id,
    threadId: rootOf(m.id),
    parentId: parent.get(m.id) ?? null,
    inclusive: !descendants(m.id).some((d) => contains(byId.get(d)!, m)),
  }));
}
