import { describe, expect, it } from 'vitest';
import { evaluateRanking } from './metrics';
import { parseDocsJsonl, parseQrels, parseQueriesJsonl } from './readers';

describe('metrics, worked by hand', () => {
  // Manning, Raghavan & Schuetze (2008), 8.4: AP averages precision at each relevant hit.
  it('average precision, P@10, R-precision', () => {
    const relevant = new Map([
      ['a', 1],
      ['b', 1],
      ['c', 1],
    ]);
    // Relevant at ranks 1, 3; c never retrieved: AP = (1/1 + 2/3) / 3 = 0.5556.
    const m = evaluateRanking(['a', 'x', 'b', 'y'], relevant);
    expect(m.ap).toBeCloseTo((1 + 2 / 3) / 3, 10);
    expect(m.p10).toBeCloseTo(0.2, 10);
    expect(m.rprec).toBeCloseTo(2 / 3, 10); // R = 3: a, x, b -> 2 of 3
  });

  // Jarvelin & Kekalainen (2002): DCG with graded gains, log2(i + 1) discount.
  it('nDCG@10 with graded gains', () => {
    const relevant = new Map([
      ['a', 3],
      ['b', 1],
    ]);
    // Ranking b, a: DCG = 1/log2(2) + 3/log2(3) = 2.8928; ideal a, b: 3 + 1/log2(3) = 3.6309.
    const m = evaluateRanking(['b', 'a'], relevant);
    expect(m.ndcg10).toBeCloseTo((1 + 3 / Math.log2(3)) / (3 + 1 / Math.log2(3)), 10);
    expect(evaluateRanking(['a', 'b'], relevant).ndcg10).toBeCloseTo(1, 12);
  });

  it('counts a repeated id once', () => {
    const m = evaluateRanking(
      ['a', 'a'],
      new Map([
        ['a', 1],
        ['b', 1],
      ]),
    );
    expect(m.ap).toBeCloseTo(0.5, 12);
  });
});

describe('readers name the file and line', () => {
  it('docs.jsonl', () => {
    expect(
      parseDocsJsonl('{"id":"1","title":"t","text":"x"}\n\n{"id":2,"text":"y"}\n', 'd.jsonl'),
    ).toEqual([
      { id: '1', title: 't', text: 'x' },
      { id: '2', title: '', text: 'y' },
    ]);
    expect(() => parseDocsJsonl('{"id":"1","text":"x"}\n{oops', 'd.jsonl')).toThrow(
      /^d\.jsonl:2: not valid JSON/,
    );
    expect(() => parseDocsJsonl('{"id":"1"}', 'd.jsonl')).toThrow(
      'd.jsonl:1: "text" must be a string',
    );
    expect(() => parseDocsJsonl('{"id":"1","text":""}\n{"id":"1","text":""}', 'd.jsonl')).toThrow(
      /d\.jsonl:2: .*twice/,
    );
  });

  it('queries.jsonl', () => {
    expect(() => parseQueriesJsonl('[1,2]', 'q.jsonl')).toThrow(
      'q.jsonl:1: expected a JSON object',
    );
  });

  it('TREC qrels: grade > 0 relevant', () => {
    const q = parseQrels('1 0 d1 2\n1 0 d2 0\n1 0 d3 -1\n2 0 d9 1\n', 'r.txt');
    expect([...q.get('1')!.entries()]).toEqual([['d1', 2]]);
    expect(() => parseQrels('1 0 d1\n', 'r.txt')).toThrow(
      'r.txt:1: expected "qid 0 docid grade", got 3 fields',
    );
    expect(() => parseQrels('1 0 d1 x\n', 'r.txt')).toThrow(/r\.txt:1: grade/);
  });
});
