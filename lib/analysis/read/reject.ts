import { AnalysisRejected, type LocatedError } from "../types";

export function reject(code: LocatedError["code"], message: string, where: { line?: number; column?: number } = {}): never {
  throw new AnalysisRejected({ code, message, ...where });
}

/** Attaches the file name to a rejection raised deeper down, leaving other errors alone. */
export function withFileName(error: unknown, fileName: string | undefined): unknown {
  if (!(error instanceof AnalysisRejected) || fileName === undefined) return error;
  return new AnalysisRejected({ ...error.detail, file: fileName });
}
