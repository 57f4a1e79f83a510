import fs from "node:fs";

export interface ProcessInfo {
  pid: number;
  ppid: number;
  /** "Z" for a zombie: dead, only not yet reaped. */
  state: string;
  command: string;
}

function processInfo(pid: number): ProcessInfo | null {
  try {
    // /proc/<pid>/stat: "pid (comm) state ppid …"; comm may hold spaces, so split after its ")".
    const stat = fs.readFileSync(`/proc/${pid}/stat`, "utf8");
    const [state = "?", ppid] = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    const command = fs.readFileSync(`/proc/${pid}/cmdline`, "utf8").split("\0").join(" ").trim();
    return { pid, ppid: Number(ppid), state, command };
  } catch {
    return null; // gone meanwhile
  }
}

/** Every live process below `root` (Linux /proc), parents before children. */
export function descendants(root: number): ProcessInfo[] {
  const all = fs
    .readdirSync("/proc")
    .filter((name) => /^\d+$/.test(name))
    .map((name) => processInfo(Number(name)))
    .filter((p): p is ProcessInfo => p !== null);
  const out: ProcessInfo[] = [];
  const frontier = [root];
  while (frontier.length > 0) {
    const parent = frontier.shift();
    for (const p of all.filter((q) => q.ppid === parent)) {
      out.push(p);
      frontier.push(p.pid);
    }
  }
  return out;
}

/** The pid of the Next.js server that `npm start` (started as `root`) runs: the process that holds the database. */
export function nextServerPid(root: number): number {
  const server = descendants(root).find((p) => /next(\/dist\/bin\/next)? start\b|next-server/.test(p.command));
  if (!server) throw new Error(`no Next.js server below process ${root}: ${JSON.stringify(descendants(root))}`);
  return server.pid;
}

export function isAlive(pid: number): boolean {
  const p = processInfo(pid);
  return p !== null && p.state !== "Z";
}
