import { createHash, randomBytes } from "node:crypto";
import { request as httpRequest } from "node:http";
import { mkdir, mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { createRouteHandler, createUploadthing, type FileRouter, UTApi, UTFile } from "uploadthing/server";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { startUploadFake, type UploadFake } from "@/fakes/uploadthing/server";
import { signUrl } from "@/fakes/uploadthing/signing";
import { decodeToken, makeFakeToken } from "@/fakes/uploadthing/token";
import { type PresignedUpload, putToPresigned, requestPresignedUrls } from "./support/browser-upload";
import { serveWebHandler } from "./support/serve-web-handler";

// The real SDK is exercised here, configured only through the environment it reads at call time
// (effect's ConfigProvider.fromEnv reads process.env on each lookup), so stubbing env per test works.

const API_KEY = "sk_kneepoint_local_signing_key";
const APP_ID = "kneepointtestapp";

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

let dataDir: string;
let fake: UploadFake;

function pointSdkAt(fakeUrl: string, mode: "prod" | "dev", callbackUrl?: string): void {
  vi.stubEnv("UPLOADTHING_TOKEN", makeFakeToken({ apiKey: API_KEY, appId: APP_ID, region: "local" }));
  vi.stubEnv("UPLOADTHING_INGEST_URL", fakeUrl);
  vi.stubEnv("UPLOADTHING_API_URL", fakeUrl);
  vi.stubEnv("UPLOADTHING_UFS_HOST", new URL(fakeUrl).host);
  vi.stubEnv("UPLOADTHING_UFS_APP_ID_LOCATION", "path");
  vi.stubEnv("UPLOADTHING_IS_DEV", mode === "dev" ? "true" : "false");
  // Refusals below are deliberate; the SDK would log each one.
  vi.stubEnv("UPLOADTHING_LOG_LEVEL", "Fatal");
  if (callbackUrl) vi.stubEnv("UPLOADTHING_CALLBACK_URL", callbackUrl);
}

async function download(url: string, init?: RequestInit): Promise<{ status: number; bytes: Buffer; headers: Headers }> {
  const response = await fetch(url, init);
  return { status: response.status, bytes: Buffer.from(await response.arrayBuffer()), headers: response.headers };
}

async function uploadOne(utapi: UTApi, file: UTFile, opts?: Parameters<UTApi["uploadFiles"]>[1]) {
  const result = await utapi.uploadFiles(file, opts);
  if (!result.data) throw new Error(`upload failed: ${JSON.stringify(result.error)}`);
  return result.data;
}

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-upload-fake-"));
  fake = await startUploadFake({ port: 0, dataDir, apiKey: API_KEY, appId: APP_ID, log: () => undefined });
});

beforeEach(() => {
  pointSdkAt(fake.url, "prod");
});

afterAll(async () => {
  vi.unstubAllEnvs();
  await fake.close();
  await rm(dataDir, { recursive: true, force: true });
});

describe("token helper", () => {
  it("round-trips and is accepted by the SDK's own decoder (UTApi uses it to sign)", async () => {
    const token = makeFakeToken({ apiKey: API_KEY, appId: APP_ID, region: "local" });
    expect(decodeToken(token)).toEqual({ apiKey: API_KEY, appId: APP_ID, regions: ["local"] });
    // A URL signed with the decoded key must verify at the fake; a different key must not.
    await expect(new UTApi({ token }).listFiles()).resolves.toHaveProperty("files");
    const wrong = makeFakeToken({ apiKey: "sk_someone_else", appId: APP_ID, region: "local" });
    await expect(new UTApi({ token: wrong }).listFiles()).rejects.toThrow();
  });

  it("refuses keys the SDK would refuse", () => {
    expect(() => makeFakeToken({ apiKey: "pk_public", appId: APP_ID, region: "local" })).toThrow(/sk_/);
    expect(() => decodeToken("not base64 json")).toThrow(/base64/);
  });
});

describe("server-side UTApi against the fake", () => {
  it("uploads, lists, resolves, downloads identical bytes and deletes", async () => {
    const utapi = new UTApi();
    const bytes = randomBytes(3 * 1024 * 1024 + 17);
    const uploaded = await uploadOne(utapi, new UTFile([bytes], "cell-07-cycles.csv", { type: "text/csv", customId: "run-0042" }));
    expect(uploaded).toMatchObject({ name: "cell-07-cycles.csv", size: bytes.length, customId: "run-0042", fileHash: sha256(bytes) });

    const listed = await utapi.listFiles();
    expect(listed.files).toContainEqual(
      expect.objectContaining({ key: uploaded.key, name: "cell-07-cycles.csv", size: bytes.length, customId: "run-0042", status: "Uploaded" }),
    );

    const { data: urls } = await utapi.getFileUrls(uploaded.key);
    expect(urls.map((u) => u.key)).toEqual([uploaded.key]);
    for (const url of [urls[0]?.url ?? "", uploaded.ufsUrl]) {
      const got = await download(url);
      expect(got.status).toBe(200);
      expect(got.headers.get("content-type")).toBe("text/csv");
      expect(sha256(got.bytes)).toBe(sha256(bytes));
      expect(got.bytes.equals(bytes)).toBe(true);
    }

    await expect(utapi.deleteFiles(uploaded.key)).resolves.toEqual({ success: true, deletedCount: 1 });
    expect((await utapi.listFiles()).files.map((f) => f.key)).not.toContain(uploaded.key);
    const gone = await fetch(uploaded.ufsUrl);
    expect(gone.status).toBe(404);
    expect(await gone.json()).toEqual({ error: "No such file" });
  });

  it("records SHA-256 as fileHash (FIPS 180-2, appendix B.1: SHA-256 of 'abc')", async () => {
    const uploaded = await uploadOne(new UTApi(), new UTFile([Buffer.from("abc")], "abc.txt"));
    expect(uploaded.fileHash).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("serves byte ranges from disk (RFC 9110 §14)", async () => {
    const bytes = randomBytes(1000);
    const { ufsUrl } = await uploadOne(new UTApi(), new UTFile([bytes], "range.bin"));
    const middle = await download(ufsUrl, { headers: { Range: "bytes=100-199" } });
    expect(middle.status).toBe(206);
    expect(middle.headers.get("content-range")).toBe("bytes 100-199/1000");
    expect(middle.bytes.equals(bytes.subarray(100, 200))).toBe(true);
    const tail = await download(ufsUrl, { headers: { Range: "bytes=-10" } });
    expect(tail.bytes.equals(bytes.subarray(990))).toBe(true);
    const beyond = await download(ufsUrl, { headers: { Range: "bytes=1000-" } });
    expect(beyond.status).toBe(416);
    expect(beyond.headers.get("content-range")).toBe("bytes */1000");
  });

  it("renames, reports usage and uses custom ids as keys", async () => {
    const utapi = new UTApi();
    const bytes = randomBytes(64);
    const uploaded = await uploadOne(utapi, new UTFile([bytes], "draft.csv", { customId: "rename-me" }));
    await expect(utapi.renameFiles({ customId: "rename-me", newName: "final.csv" })).resolves.toEqual({ success: true });
    expect((await utapi.listFiles()).files.find((f) => f.key === uploaded.key)?.name).toBe("final.csv");
    const usage = await utapi.getUsageInfo();
    expect(usage.filesUploaded).toBe((await utapi.listFiles()).files.length);
    expect(usage.totalBytes).toBeGreaterThanOrEqual(64);
    await expect(utapi.renameFiles({ fileKey: "missingkey", newName: "x" })).rejects.toThrow();
    await expect(utapi.deleteFiles("rename-me", { keyType: "customId" })).resolves.toEqual({ success: true, deletedCount: 1 });
  });

  it("keeps files across a restart of the fake", async () => {
    const bytes = randomBytes(200_000);
    const uploaded = await uploadOne(new UTApi(), new UTFile([bytes], "kept.bin"));
    const port = Number(new URL(fake.url).port);
    await fake.close();
    fake = await startUploadFake({ port, dataDir, apiKey: API_KEY, appId: APP_ID, log: () => undefined });
    expect((await new UTApi().listFiles()).files).toContainEqual(expect.objectContaining({ key: uploaded.key, size: bytes.length }));
    const got = await download(uploaded.ufsUrl);
    expect(got.status).toBe(200);
    expect(sha256(got.bytes)).toBe(uploaded.fileHash);
  });
});

describe("private files and signatures", () => {
  it("needs a signature for private files and accepts both SDK signing paths", async () => {
    const utapi = new UTApi();
    const bytes = randomBytes(4096);
    const { key, ufsUrl } = await uploadOne(utapi, new UTFile([bytes], "private.bin"), { acl: "private" });

    const unsigned = await fetch(ufsUrl);
    expect(unsigned.status).toBe(403);
    expect(await unsigned.json()).toHaveProperty("error");

    const local = await utapi.generateSignedURL(key, { expiresIn: 600 });
    const viaApi = await utapi.getSignedURL(key, { expiresIn: 600 });
    for (const url of [local.ufsUrl, viaApi.ufsUrl, viaApi.url]) {
      const got = await download(url);
      expect(got.status).toBe(200);
      expect(got.bytes.equals(bytes)).toBe(true);
    }

    const lastChar = local.ufsUrl.at(-1) === "0" ? "1" : "0";
    const tampered = await fetch(local.ufsUrl.slice(0, -1) + lastChar);
    expect(tampered.status).toBe(403);
    expect(await tampered.json()).toEqual({ error: "This file is private: The URL signature is invalid" });

    const expired = signUrl(`${fake.url}/a/${APP_ID}/${key}`, API_KEY, 60, {}, Date.now() - 3_600_000);
    const late = await fetch(expired);
    expect(late.status).toBe(403);
    expect(await late.json()).toEqual({ error: "This file is private: The signed URL has expired" });

    await expect(utapi.updateACL(key, "public-read")).resolves.toEqual({ success: true });
    expect((await fetch(ufsUrl)).status).toBe(200);
  });

  it("refuses API calls with a wrong key and bad requests with JSON errors", async () => {
    const wrongKey = await fetch(`${fake.url}/v6/listFiles`, { method: "POST", headers: { "x-uploadthing-api-key": "sk_nope" }, body: "{}" });
    expect(wrongKey.status).toBe(401);
    expect(await wrongKey.json()).toEqual({ error: "Missing or wrong x-uploadthing-api-key" });

    const badJson = await fetch(`${fake.url}/v6/listFiles`, { method: "POST", headers: { "x-uploadthing-api-key": API_KEY }, body: "{" });
    expect(badJson.status).toBe(400);
    expect(await badJson.json()).toEqual({ error: "Request body is not valid JSON" });

    const badShape = await fetch(`${fake.url}/v6/listFiles`, { method: "POST", headers: { "x-uploadthing-api-key": API_KEY }, body: '{"limit":-1}' });
    expect(badShape.status).toBe(400);
    expect(((await badShape.json()) as { error: string }).error).toMatch(/^Invalid listFiles body/);

    const nowhere = await fetch(`${fake.url}/no/such/thing/here`);
    expect(nowhere.status).toBe(404);
    expect(await nowhere.json()).toHaveProperty("error");
  });
});

describe("browser upload flow through the real route handler", () => {
  const completions: Array<{ metadata: Record<string, unknown>; key: string; name: string; size: number; fileHash: string }> = [];
  const uploadErrors: Array<{ fileKey: string; message: string }> = [];
  const f = createUploadthing();
  const router = {
    cellLog: f({ blob: { maxFileSize: "8MB", maxFileCount: 2 } })
      .middleware(({ req }) => ({ operator: req.headers.get("x-operator") ?? "nobody", bench: 7 }))
      .onUploadError(({ fileKey, error }) => {
        uploadErrors.push({ fileKey, message: error.message });
      })
      .onUploadComplete(({ metadata, file }) => {
        completions.push({ metadata, key: file.key, name: file.name, size: file.size, fileHash: file.fileHash });
        return { acceptedKey: file.key, operator: metadata.operator };
      }),
    // A negative TTL makes the SDK itself sign URLs that are already expired.
    expiredLink: f({ blob: { maxFileSize: "1MB" } }, { presignedURLTTL: -60 }).onUploadComplete(() => undefined),
  } satisfies FileRouter;
  const handler = createRouteHandler({ router });
  let app: { url: string; close(): Promise<void> };
  let routeUrl: string;

  beforeAll(async () => {
    app = await serveWebHandler((request) => handler(request));
    routeUrl = `${app.url}/api/uploadthing`;
  });

  afterAll(async () => {
    await app.close();
  });

  beforeEach(() => {
    completions.length = 0;
    uploadErrors.length = 0;
  });

  const csv = (label: string) =>
    new File([`time_s,voltage_V,current_A\n0,4.200,-1.000\n60,4.105,-1.000\n# ${label}\n`], `${label}.csv`, { type: "text/csv" });

  async function expectCompleted(file: File, presigned: PresignedUpload, operator: string): Promise<void> {
    const bytes = Buffer.from(await file.arrayBuffer());
    const result = await putToPresigned(presigned, file);
    expect(result.rangeStart).toBe(0);
    expect(result.putStatus).toBe(200);
    expect(result.putBody).not.toHaveProperty("error");
    expect(result.putBody.serverData).toEqual({ acceptedKey: presigned.key, operator });
    expect(result.putBody.fileHash).toBe(sha256(bytes));
    expect(completions).toContainEqual({
      metadata: { operator, bench: 7 },
      key: presigned.key,
      name: file.name,
      size: bytes.length,
      fileHash: sha256(bytes),
    });
    const stored = await download(String(result.putBody.ufsUrl));
    expect(stored.bytes.equals(bytes)).toBe(true);
  }

  for (const mode of ["prod", "dev"] as const) {
    it(`runs onUploadComplete and returns its serverData (${mode} callback mode)`, async () => {
      pointSdkAt(fake.url, mode, routeUrl);
      const config = (await (await fetch(routeUrl)).json()) as Array<{ slug: string }>;
      expect(config.map((route) => route.slug)).toEqual(["cellLog", "expiredLink"]);

      const files = [csv(`${mode}-first`), csv(`${mode}-second`)];
      const presigned = await requestPresignedUrls(routeUrl, "cellLog", files, { "x-operator": `operator-${mode}` });
      expect(presigned.map((p) => p.name)).toEqual(files.map((file) => file.name));
      for (const [i, file] of files.entries()) {
        const target = presigned[i];
        if (!target) throw new Error("missing presigned URL");
        await expectCompleted(file, target, `operator-${mode}`);
      }
      expect(completions).toHaveLength(2);
    });
  }

  for (const mode of ["prod", "dev"] as const) {
    it(`runs onUploadError when the fake cannot store the file, and a retry still succeeds (${mode})`, async () => {
      pointSdkAt(fake.url, mode, routeUrl);
      const file = csv(`${mode}-storage-failure`);
      const [presigned] = await requestPresignedUrls(routeUrl, "cellLog", [file]);
      if (!presigned) throw new Error("missing presigned URL");
      // A directory where the partial upload should go makes the disk write fail on the fake's side.
      await mkdir(path.join(dataDir, "partial", presigned.key));
      const failed = await putToPresigned(presigned, file);
      expect(failed.putStatus).toBe(500);
      expect(failed.putBody).toEqual({ error: "Internal error in the local fake" });
      await vi.waitFor(() =>
        expect(uploadErrors).toEqual([
          { fileKey: presigned.key, message: `Upload failed for ${presigned.key}: The upload fake could not store the file (EISDIR)` },
        ]),
      );
      expect(completions).toEqual([]);
      await expectCompleted(file, presigned, "nobody");
    });
  }

  it("answers the browser's CORS preflight", async () => {
    pointSdkAt(fake.url, "prod", routeUrl);
    const [presigned] = await requestPresignedUrls(routeUrl, "cellLog", [csv("cors")]);
    const preflight = await fetch(presigned?.url ?? "", {
      method: "OPTIONS",
      headers: { Origin: "http://localhost:3000", "Access-Control-Request-Method": "PUT", "Access-Control-Request-Headers": "range,x-uploadthing-version" },
    });
    expect(preflight.status).toBe(204);
    expect(preflight.headers.get("access-control-allow-origin")).toBe("*");
    expect(preflight.headers.get("access-control-allow-methods")).toContain("PUT");
    expect(preflight.headers.get("access-control-allow-headers")).toBe("range,x-uploadthing-version");
    const head = await fetch(presigned?.url ?? "", { method: "HEAD" });
    expect(head.headers.get("access-control-expose-headers")).toContain("x-ut-range-start");
  });

  it("refuses tampered and SDK-expired upload URLs, and the wrong size", async () => {
    pointSdkAt(fake.url, "prod", routeUrl);
    const file = csv("refusals");
    const [presigned] = await requestPresignedUrls(routeUrl, "cellLog", [file]);
    if (!presigned) throw new Error("missing presigned URL");
    const form = (blob: Blob) => {
      const body = new FormData();
      body.append("file", blob);
      return body;
    };

    const tamperedUrl = presigned.url.replace(/x-ut-file-size=\d+/, "x-ut-file-size=999999");
    const tampered = await fetch(tamperedUrl, { method: "PUT", body: form(file) });
    expect(tampered.status).toBe(403);
    expect(await tampered.json()).toEqual({ error: "The URL signature is invalid" });

    const larger = await fetch(presigned.url, { method: "PUT", body: form(new Blob([await file.arrayBuffer(), "extra"])) });
    expect(larger.status).toBe(413);
    expect(((await larger.json()) as { error: string }).error).toMatch(/larger than/);

    const notMultipart = await fetch(presigned.url, { method: "PUT", body: "plain text", headers: { "content-type": "text/plain" } });
    expect(notMultipart.status).toBe(400);
    expect(await notMultipart.json()).toEqual({ error: "Expected a multipart/form-data body with a `file` field" });

    const [stale] = await requestPresignedUrls(routeUrl, "expiredLink", [file]);
    const expired = await fetch(stale?.url ?? "", { method: "PUT", body: form(file) });
    expect(expired.status).toBe(403);
    expect(await expired.json()).toEqual({ error: "The signed URL has expired" });

    // The refusals left nothing behind: the genuine upload still goes through.
    await expectCompleted(file, presigned, "nobody");
  });

  it("resumes an interrupted upload from the offset HEAD reports", async () => {
    pointSdkAt(fake.url, "prod", routeUrl);
    const bytes = randomBytes(2 * 1024 * 1024);
    const file = new File([bytes], "interrupted.bin", { type: "application/octet-stream" });
    const [presigned] = await requestPresignedUrls(routeUrl, "cellLog", [file], { "x-operator": "resumer" });
    if (!presigned) throw new Error("missing presigned URL");

    // Send the multipart head and half the bytes, wait until some reached the fake's disk, then drop the connection.
    const boundary = "kneepointboundary";
    const target = new URL(presigned.url);
    const interrupted = httpRequest(target, {
      method: "PUT",
      headers: { "content-type": `multipart/form-data; boundary=${boundary}`, "content-length": String(bytes.length + 400) },
    });
    interrupted.on("error", () => undefined);
    interrupted.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="interrupted.bin"\r\n\r\n`);
    interrupted.write(bytes.subarray(0, bytes.length / 2));
    const rangeStart = async () => Number((await fetch(presigned.url, { method: "HEAD" })).headers.get("x-ut-range-start"));
    await vi.waitFor(async () => expect(await rangeStart()).toBeGreaterThan(0), { timeout: 10_000, interval: 20 });
    interrupted.destroy();

    // A resume at the wrong offset is refused without losing what is stored (409 while the dropped request winds down).
    const wrongOffset = new FormData();
    wrongOffset.append("file", file.slice(bytes.length - 1));
    await vi.waitFor(
      async () => {
        const refused = await fetch(presigned.url, { method: "PUT", headers: { Range: `bytes=${bytes.length - 1}-` }, body: wrongOffset });
        expect(refused.status).toBe(416);
      },
      { timeout: 10_000, interval: 50 },
    );
    expect(await rangeStart()).toBeGreaterThan(0);

    // The aborted request may still hold the key for a moment; the browser would simply retry.
    const result = await vi.waitFor(
      async () => {
        const attempt = await putToPresigned(presigned, file);
        expect(attempt.putStatus).toBe(200);
        return attempt;
      },
      { timeout: 10_000, interval: 50 },
    );
    expect(result.rangeStart).toBeGreaterThan(0);
    expect(result.rangeStart).toBeLessThanOrEqual(bytes.length / 2);
    expect(result.putBody.fileHash).toBe(sha256(bytes));
    expect(result.putBody.serverData).toEqual({ acceptedKey: presigned.key, operator: "resumer" });
    const stored = await download(String(result.putBody.ufsUrl));
    expect(stored.bytes.equals(bytes)).toBe(true);
  });
});
