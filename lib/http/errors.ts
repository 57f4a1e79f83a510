/**
 * One error type for route handlers and server actions, so every failure maps to the same
 * status codes and body shape. Database and library causes are logged on the server and never
 * sent to the client.
 */
export type AppErrorCode =
  | "bad-request"
  | "unauthenticated"
  | "forbidden"
  | "not-found"
  | "conflict"
  | "payload-too-large"
  | "unprocessable"
  | "rate-limited";

const statusByCode: Record<AppErrorCode, number> = {
  "bad-request": 400,
  unauthenticated: 401,
  forbidden: 403,
  "not-found": 404,
  conflict: 409,
  "payload-too-large": 413,
  unprocessable: 422,
  "rate-limited": 429,
};

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  readonly code: AppErrorCode;
  readonly fieldErrors?: FieldErrors;
  readonly details?: Record<string, unknown>;

  constructor(code: AppErrorCode, message: string, options?: { fieldErrors?: FieldErrors; details?: Record<string, unknown> }) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.fieldErrors = options?.fieldErrors;
    this.details = options?.details;
  }

  get status(): number {
    return statusByCode[this.code];
  }

  toResponse(): Response {
    const retryAfterMs = this.details?.retryAfterMs;
    // RFC 9110 §10.2.3: whole seconds; the body keeps the milliseconds for clients that want them.
    const headers: HeadersInit = typeof retryAfterMs === "number" ? { "retry-after": String(Math.max(1, Math.ceil(retryAfterMs / 1000))) } : {};
    return Response.json(
      { error: this.message, code: this.code, fieldErrors: this.fieldErrors, ...this.details },
      { status: this.status, headers },
    );
  }
}

/** Turns anything thrown into a safe response: AppErrors as they are, the rest as a bare 500. */
export function errorResponse(error: unknown): Response {
  if (error instanceof AppError) return error.toResponse();
  console.error(error);
  return Response.json({ error: "Something went wrong on the server. The error was logged.", code: "internal" }, { status: 500 });
}
