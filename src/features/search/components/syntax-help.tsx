/** One example per operator of the query language (docs/SEARCH.md, "Query language"). */
const EXAMPLES: { example: string; meaning: string }[] = [
  { example: 'price increase', meaning: 'plain words: ranked, any of the words' },
  { example: 'loyalty AND credit', meaning: 'both words (operators in capitals)' },
  { example: 'loyalty OR rebate', meaning: 'either word' },
  { example: 'sheaf NOT wendle', meaning: 'the first, without the second' },
  { example: '(rebate OR credit) AND loyalty', meaning: 'parentheses group' },
  { example: '"loyalty credit"', meaning: 'the exact phrase' },
  { example: '"price increase"~5', meaning: 'the words within 5 words of each other' },
  { example: 'weev*', meaning: 'words starting with weev' },
  { example: 'exact:running', meaning: 'this word form only (no stemming)' },
  { example: 'from:alice  to:  cc:  bcc:', meaning: 'e-mail addresses or names' },
  { example: 'subject:budget', meaning: 'in the title or subject' },
  { example: 'author:  custodian:  filename:', meaning: 'document metadata' },
  { example: 'type:email  control:ABC-000123', meaning: 'document type, control number' },
  { example: 'date:[2020-01-01 TO 2020-06-30]', meaning: 'dated in the range (inclusive)' },
];

/** The query syntax card beside the search box. */
export function SyntaxHelp() {
  return (
    <details className="text-xs text-ink-muted" data-testid="syntax-help">
      <summary className="cursor-pointer select-none text-ink-muted hover:text-ink">
        Query syntax
      </summary>
      <div className="mt-1.5 rounded-md border border-line bg-sunk p-2">
        <p className="mb-1.5">
          NOT binds tighter than AND, AND tighter than OR; words side by side mean OR. Any operator
          makes the search a filter: only documents that satisfy it are listed.
        </p>
        <dl className="grid grid-cols-[minmax(0,auto)_minmax(0,1fr)] gap-x-3 gap-y-0.5">
          {EXAMPLES.map((e) => (
            <div key={e.example} className="contents">
              <dt className="font-mono text-ink">{e.example}</dt>
              <dd>{e.meaning}</dd>
            </div>
          ))}
        </dl>
      </div>
    </details>
  );
}
