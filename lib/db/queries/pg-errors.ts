import "server-only";

/** PostgreSQL's unique_violation; drizzle wraps the driver error, so look through `cause`. */
export function isUniqueViolation(error: unknown): boolean {
  for (let e: unknown = error; e && typeof e === "object"; e = (e as { cause?: unknown }).cause) {
    if ((e as { code?: unknown }).code === "23505") return true;
  }
  return false;
}
