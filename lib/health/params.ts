import { identifierField } from "@/lib/validations/fields";

const serialParam = identifierField("Serial");

/** A serial from a page param: params arrive still percent-encoded, and "%" is not a serial character, so one decode is exact. */
export function serialFromParam(raw: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(raw);
  } catch {
    return null;
  }
  const parsed = serialParam.safeParse(decoded);
  return parsed.success ? parsed.data : null;
}
