/** The one error shape the web edge answers with. */
export interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string> };
}

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    /** Headers the answer carries as well (Retry-After on a 429). */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}
