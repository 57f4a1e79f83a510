import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => (typeof address === "object" && address ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

export interface AppServer {
  url: string;
  dataRoot: string;
  process: ChildProcess;
  output: () => string;
  stop(signal?: NodeJS.Signals): Promise<number | null>;
}

export function newDataRoot(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), "kneepoint-e2e-"));
}

/**
 * Starts the app exactly as the README's start command does (`npm start`: local services, seed,
 * the built server), on free ports and a fresh data directory, or on `options.dataRoot` to
 * restart on the data a previous server left.
 */
export async function startAppServer(extraEnv: Record<string, string> = {}, options: { dataRoot?: string } = {}): Promise<AppServer> {
  const port = await freePort();
  const fakePorts = { FAKE_UPLOAD_PORT: String(await freePort()), FAKE_SMTP_PORT: String(await freePort()), FAKE_SMTP_HTTP_PORT: String(await freePort()) };
  const dataRoot = options.dataRoot ?? newDataRoot();
  const url = `http://localhost:${port}`;
  let log = "";
  const child = spawn(process.execPath, [path.join("node_modules", "tsx", "dist", "cli.mjs"), "--conditions=react-server", "lib/cli/start.ts"], {
    cwd: process.cwd(),
    env: { ...process.env, PORT: String(port), KNEEPOINT_DATA_ROOT: dataRoot, BETTER_AUTH_URL: url, ...fakePorts, ...extraEnv },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", (d: Buffer) => (log += d.toString()));
  child.stderr?.on("data", (d: Buffer) => (log += d.toString()));
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));

  const deadline = Date.now() + 200_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The app exited early:\n${log}`);
    try {
      const response = await fetch(`${url}/sign-in`);
      if (response.status === 200) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill("SIGKILL");
      throw new Error(`The app did not come up in time:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 500));
  }
  return {
    url,
    dataRoot,
    process: child,
    output: () => log,
    async stop(signal = "SIGTERM") {
      if (child.exitCode === null) child.kill(signal);
      return exited;
    },
  };
}
