// Problems with an uploaded history as a whole, shaped for RFC 9457 problem+json answers.

export interface IngestExample {
  /** 1-based line number in the file. */
  line: number;
  text: string;
  problem: string;
}

export type IngestErrorStatus = 400 | 413 | 415 | 422;

/** A problem with the file as a whole; maps onto an RFC 9457 problem+json response. */
export class IngestError extends Error {
  readonly status: IngestErrorStatus;
  readonly title: string;
  readonly detail: string;
  readonly examples: IngestExample[];
  /** The request field the problem is in ("samples.3.0", "csv"), when the caller knows it. */
  path?: string;
  /** The ingest option the problem is in ("voltageKv"): a query parameter of an upload, `csvOptions.…` of a stateless request. */
  option?: string;

  constructor(status: IngestErrorStatus, title: string, detail: string, examples: IngestExample[] = [], path?: string) {
    super(`${title}: ${detail}`);
    this.name = "IngestError";
    this.status = status;
    this.title = title;
    this.detail = detail;
    this.examples = examples;
    this.path = path;
  }
}

/** At most this many example rows go with a problem. */
export const MAX_EXAMPLES = 10;
