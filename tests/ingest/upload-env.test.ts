/**
 * Nothing may silently target the hosted upload service: without the service URLs the app
 * refuses to start, with a message naming what is missing.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { makeFakeToken } from "@/fakes/uploadthing/token";
import { uploadEnv, uploadEnvProblems, UploadServiceNotConfigured } from "@/lib/uploads/env";

const token = makeFakeToken({ apiKey: "sk_env_test", appId: "envtest", region: "local" });
const complete = { UPLOADTHING_TOKEN: token, UPLOADTHING_INGEST_URL: "http://localhost:4001", UPLOADTHING_API_URL: "http://localhost:4001" };

describe("upload service settings", () => {
  it("accept a complete local configuration", () => {
    expect(uploadEnvProblems(complete)).toEqual([]);
    expect(uploadEnv(complete).UPLOADTHING_INGEST_URL).toBe("http://localhost:4001");
  });

  it("name each missing or malformed setting", () => {
    const { UPLOADTHING_API_URL: _api, ...noApi } = complete;
    expect(uploadEnvProblems(noApi)).toEqual([expect.stringMatching(/^UPLOADTHING_API_URL is not set: .*hosted service/)]);
    const { UPLOADTHING_INGEST_URL: _ingest, ...noIngest } = complete;
    expect(uploadEnvProblems(noIngest)).toEqual([expect.stringMatching(/^UPLOADTHING_INGEST_URL is not set: .*hosted service/)]);
    expect(uploadEnvProblems({ ...complete, UPLOADTHING_TOKEN: "not a token" })).toEqual([expect.stringMatching(/UPLOADTHING_TOKEN is not a valid token/)]);
    expect(uploadEnvProblems({ ...complete, UPLOADTHING_API_URL: "" })).toEqual([expect.stringMatching(/UPLOADTHING_API_URL is empty/)]);
    expect(() => uploadEnv(noApi)).toThrow(UploadServiceNotConfigured);
    expect(() => uploadEnv(noApi)).toThrow(/Kneepoint cannot start: the upload service is not configured/);
  });

  it("stop the start command before anything is built or served", () => {
    const dataRoot = mkdtempSync(path.join(os.tmpdir(), "kneepoint-env-"));
    try {
      // An ingest URL alone means "use a real service", so no local fake fills the gap.
      const result = spawnSync(process.execPath, [path.join("node_modules", "tsx", "dist", "cli.mjs"), "--conditions=react-server", "lib/cli/start.ts"], {
        env: { NODE_ENV: "production", PATH: process.env.PATH, HOME: process.env.HOME, KNEEPOINT_DATA_ROOT: dataRoot, UPLOADTHING_TOKEN: token, UPLOADTHING_INGEST_URL: "http://localhost:4001", SMTP_URL: "smtp://127.0.0.1:1", PORT: "0" },
        encoding: "utf8",
        timeout: 60_000,
      });
      expect(result.status).toBe(1);
      expect(result.stderr).toMatch(/Kneepoint cannot start: the upload service is not configured\n {2}UPLOADTHING_API_URL is not set/);
      expect(result.stdout).not.toMatch(/Building the app/);
    } finally {
      rmSync(dataRoot, { recursive: true, force: true });
    }
  });
});
