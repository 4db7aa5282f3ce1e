// The part of autocannon 9's API scripts/bench/load.ts uses (the package ships no types).
declare module 'autocannon' {
  interface RequestParams {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    timeout?: number;
    requests?: (RequestParams & { setupRequest?: (req: RequestParams) => RequestParams })[];
  }
  interface Result {
    errors: number;
    timeouts: number;
  }
  interface Instance extends PromiseLike<Result> {
    on(
      event: 'response',
      listener: (client: unknown, statusCode: number, bytes: number, responseTime: number) => void,
    ): void;
  }
  function autocannon(options: Options): Instance;
  export default autocannon;
}
