import "server-only";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

/**
 * An exclusive lock on a PGlite data directory.
 *
 * PGlite lets a second process open a directory that another process already uses, and both then
 * see only their own writes: rows are silently lost. So every opener takes this lock first and a
 * second opener fails fast. A lock left by a process that no longer runs (kill -9, power loss) is
 * stale and taken over.
 */
export class DataDirectoryInUseError extends Error {
  constructor(dir: string, holder: LockHolder) {
    super(
      `The database directory ${dir} is already in use by process ${holder.pid} on ${holder.host} ` +
        `(since ${holder.since}). Only one Kneepoint process may open it at a time: stop the other ` +
        `process, or point KNEEPOINT_DATA_DIR at another directory.`,
    );
    this.name = "DataDirectoryInUseError";
  }
}

interface LockHolder {
  pid: number;
  host: string;
  since: string;
}

export interface DirectoryLock {
  release(): void;
}

function lockPath(dir: string): string {
  return path.join(dir, "kneepoint.lock");
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM means the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

function readHolder(file: string): LockHolder | null {
  try {
    const parsed = JSON.parse(fs.readFileSync(file, "utf8")) as Partial<LockHolder>;
    if (typeof parsed.pid !== "number") return null;
    return { pid: parsed.pid, host: String(parsed.host ?? "?"), since: String(parsed.since ?? "?") };
  } catch {
    return null;
  }
}

export function lockDataDirectory(dir: string): DirectoryLock {
  fs.mkdirSync(dir, { recursive: true });
  const file = lockPath(dir);
  const me: LockHolder = { pid: process.pid, host: os.hostname(), since: new Date().toISOString() };

  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      const fd = fs.openSync(file, "wx");
      fs.writeSync(fd, JSON.stringify(me));
      fs.closeSync(fd);
      let released = false;
      return {
        release() {
          if (released) return;
          released = true;
          const holder = readHolder(file);
          if (holder?.pid === process.pid) fs.rmSync(file, { force: true });
        },
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
      const holder = readHolder(file);
      const sameHost = holder?.host === os.hostname();
      if (holder && holder.pid !== process.pid && (!sameHost || isAlive(holder.pid))) {
        throw new DataDirectoryInUseError(dir, holder);
      }
      if (holder && holder.pid === process.pid) {
        throw new DataDirectoryInUseError(dir, holder);
      }
      // Stale lock (its process is gone) or an unreadable half-written one: take it over.
      fs.rmSync(file, { force: true });
    }
  }
  throw new Error(`Could not take the lock on ${dir}`);
}
