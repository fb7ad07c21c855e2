// The part of csv-parse's synchronous parser that shared/ uses, declared without Node's types: the
// package's own declarations reference them, which would bring Buffer and the rest of Node into the
// check of code meant to run in a browser too. tsconfig.shared.json and tsconfig.client.json read
// 'csv-parse/sync' through this file; tsconfig.server.json checks the same code against the package's.
export class CsvError extends Error {
  readonly code: string;
  [key: string]: unknown;
}

export interface Options {
  comment?: string;
  comment_no_infix?: boolean;
  info?: boolean;
  on_skip?: (error: CsvError | undefined, raw: string | undefined) => undefined;
  relax_column_count?: boolean;
  relax_quotes?: boolean;
  skip_empty_lines?: boolean;
  skip_records_with_error?: boolean;
}

export function parse(input: string | Uint8Array, options?: Options): string[][];
