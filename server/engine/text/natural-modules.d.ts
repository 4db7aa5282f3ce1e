// Types for the few internal modules of `natural` the engine imports. The package
// index (`natural`) is never imported: it loads database clients and dotenv.
declare module 'natural/lib/natural/stemmers/porter_stemmer' {
  const PorterStemmer: { stem(token: string): string };
  export default PorterStemmer;
}

declare module 'natural/lib/natural/util/stopwords' {
  export const words: string[];
}

declare module 'natural/lib/natural/tokenizers/regexp_tokenizer' {
  export class RegexpTokenizer {
    constructor(options: { pattern: RegExp; gaps?: boolean });
    tokenize(text: string): string[];
  }
}
