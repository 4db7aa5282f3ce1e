import { MutationObserver, QueryClient } from '@tanstack/react-query';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ReviewResponse } from '@shared/schemas/review';
import type { SearchHit, SearchResponse } from '@shared/schemas/search';
import { reviewsQueryKey } from '@/features/review/api/keys';
import { searchesQueryKey } from '@/features/search/api/keys';
import { setDocumentCodesMutationOptions } from './set-document-codes';

// Optimistic coding (TanStack Query's documented pattern: onMutate writes the cache and
// returns a snapshot, onError restores it). The server's answers are replayed through
// fetch in the API's own error format (shared/errors.ts).

const MATTER = 7;
const DOC = 42;
const hot = { id: 4, name: 'Hot' };
const responsive = { id: 1, name: 'Responsive' };

function hit(documentId: number, codes: SearchHit['codes']): SearchHit {
  return {
    documentId,
    controlNumber: `T-${documentId}`,
    title: '',
    custodian: null,
    sentAt: null,
    docType: 'text',
    score: 1,
    rawScore: 1,
    rank: 1,
    codes,
    snippet: [],
    why: { topTerms: [], nearestQueryTerms: [] },
    duplicateOf: null,
    parentId: null,
  };
}

function seed(client: QueryClient) {
  const searchKey = [...searchesQueryKey(MATTER), { query: 'q' }];
  const reviewKey = [...reviewsQueryKey(MATTER), DOC, { mode: 'hybrid' }];
  client.setQueryData(searchKey, {
    hits: [hit(DOC, [responsive]), hit(DOC + 1, [])],
  } as unknown as SearchResponse);
  client.setQueryData(reviewKey, {
    codes: [{ ...responsive, codedBy: null, codedAt: '2021-01-01T00:00:00Z' }],
  } as unknown as ReviewResponse);
  return {
    hitCodes: () =>
      client.getQueryData<SearchResponse>(searchKey)?.hits.map((h) => h.codes.map((c) => c.name)),
    reviewCodes: () => client.getQueryData<ReviewResponse>(reviewKey)?.codes.map((c) => c.name),
  };
}

function answer(status: number, body: unknown) {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json' },
  });
}

afterEach(() => vi.unstubAllGlobals());

describe('setDocumentCodesMutationOptions', () => {
  it('shows the new codes at once and keeps them when the server agrees', async () => {
    const client = new QueryClient();
    const cache = seed(client);
    let release: (r: Response) => void = () => undefined;
    vi.stubGlobal(
      'fetch',
      vi.fn(() => new Promise<Response>((resolve) => (release = resolve))),
    );
    const observer = new MutationObserver(client, setDocumentCodesMutationOptions(client, MATTER));
    const done = observer.mutate({ documentId: DOC, codes: [responsive, hot] });
    await vi.waitFor(() => expect(cache.reviewCodes()).toEqual(['Responsive', 'Hot']));
    expect(cache.hitCodes()).toEqual([['Responsive', 'Hot'], []]);
    release(
      answer(200, {
        documentId: DOC,
        codes: [
          { ...responsive, codedBy: null, codedAt: '2021-01-01T00:00:00Z' },
          { ...hot, codedBy: null, codedAt: '2021-01-02T00:00:00Z' },
        ],
        added: [hot.id],
        removed: [],
      }),
    );
    await done;
    expect(cache.reviewCodes()).toEqual(['Responsive', 'Hot']);
    const [url, init] = (fetch as unknown as ReturnType<typeof vi.fn>).mock.calls[0];
    expect(url).toBe(`/api/matters/${MATTER}/documents/${DOC}/codes`);
    expect(JSON.parse((init as RequestInit).body as string)).toEqual({ codeIds: [1, 4] });
  });

  it('puts the old codes back and reports the server refusal', async () => {
    const client = new QueryClient();
    const cache = seed(client);
    vi.stubGlobal(
      'fetch',
      vi.fn(async () =>
        answer(403, { error: { code: 'forbidden', message: 'Your role may not code documents.' } }),
      ),
    );
    const observer = new MutationObserver(client, setDocumentCodesMutationOptions(client, MATTER));
    await expect(observer.mutate({ documentId: DOC, codes: [responsive, hot] })).rejects.toThrow(
      'Your role may not code documents.',
    );
    expect(cache.reviewCodes()).toEqual(['Responsive']);
    expect(cache.hitCodes()).toEqual([['Responsive'], []]);
    expect(observer.getCurrentResult().error?.message).toBe('Your role may not code documents.');
  });
});

describe('two quick changes to one document', () => {
  it("keeps the later choice on screen while the earlier change's answer comes back", async () => {
    const client = new QueryClient();
    const cache = seed(client);
    const releases: ((r: Response) => void)[] = [];
    vi.stubGlobal(
      'fetch',
      vi.fn(() => new Promise<Response>((resolve) => releases.push(resolve))),
    );
    const options = setDocumentCodesMutationOptions(client, MATTER);
    const first = new MutationObserver(client, options).mutate({
      documentId: DOC,
      codes: [responsive, hot],
    });
    await vi.waitFor(() => expect(releases).toHaveLength(1));
    const second = new MutationObserver(client, options).mutate({ documentId: DOC, codes: [hot] });
    await vi.waitFor(() => expect(cache.reviewCodes()).toEqual(['Hot']));
    const coded = (codes: { id: number; name: string }[]) =>
      codes.map((c) => ({ ...c, codedBy: null, codedAt: '2021-01-02T00:00:00Z' }));
    releases[0](
      answer(200, {
        documentId: DOC,
        codes: coded([responsive, hot]),
        added: [hot.id],
        removed: [],
      }),
    );
    await first;
    // Before the fix the first answer wrote Responsive back until the second answer came.
    expect(cache.reviewCodes()).toEqual(['Hot']);
    await vi.waitFor(() => expect(releases).toHaveLength(2));
    releases[1](
      answer(200, { documentId: DOC, codes: coded([hot]), added: [], removed: [responsive.id] }),
    );
    await second;
    expect(cache.reviewCodes()).toEqual(['Hot']);
  });
});
