import { type ServerResponse } from "node:http";
import { z } from "zod";
import { HttpError, sendJson } from "../shared/http";
import { signPayload } from "./signing";

/** Body of `POST /route-metadata` as the route handler sends it (`handleUploadAction` in the SDK). */
export const RouteMetadataSchema = z.object({
  fileKeys: z.array(z.string().min(1)).min(1),
  metadata: z.record(z.string(), z.unknown()),
  isDev: z.boolean(),
  callbackUrl: z.url(),
  callbackSlug: z.string().min(1),
  awaitServerData: z.boolean(),
});

export const CallbackResultSchema = z.union([
  z.object({ fileKey: z.string().min(1), error: z.string() }),
  z.object({ fileKey: z.string().min(1), callbackData: z.unknown() }),
]);

/** The `file` object of a completion callback (`UploadedFileData` in the SDK's shared schemas). */
export interface UploadedFileData {
  name: string;
  size: number;
  type: string;
  customId: string | null;
  key: string;
  url: string;
  appUrl: string;
  ufsUrl: string;
  fileHash: string;
}

interface RegistrationGroup {
  pending: Set<string>;
  /** Dev mode only: the held-open response of `/route-metadata`, one JSON line per finished file. */
  stream: ServerResponse | undefined;
  timer: NodeJS.Timeout;
}

export interface Registration {
  key: string;
  metadata: Record<string, unknown>;
  isDev: boolean;
  callbackUrl: string;
  callbackSlug: string;
  awaitServerData: boolean;
  group: RegistrationGroup;
}

interface PendingResult {
  resolve(value: unknown): void;
  reject(error: Error): void;
  timer: NodeJS.Timeout;
}

export interface CallbackOptions {
  apiKey: string;
  /** Our own base URL, sent as `origin` so the app knows where to post `/callback-result`. */
  origin: string;
  metadataWaitMs: number;
  callbackWaitMs: number;
  registrationTtlMs: number;
  log(line: string): void;
}

/**
 * Ties uploads to the route handler that requested them: holds the metadata it registered,
 * delivers the signed completion callback (posted to the app in prod, streamed in dev) and
 * waits for the `onUploadComplete` result the app reports back.
 */
export class CallbackCoordinator {
  private readonly registrations = new Map<string, Registration>();
  private readonly registrationWaiters = new Map<string, Set<(registration: Registration | undefined) => void>>();
  private readonly results = new Map<string, PendingResult>();
  private readonly groups = new Set<RegistrationGroup>();

  constructor(private readonly options: CallbackOptions) {}

  register(body: z.output<typeof RouteMetadataSchema>, res: ServerResponse): void {
    const group: RegistrationGroup = {
      pending: new Set(body.fileKeys),
      stream: undefined,
      timer: setTimeout(() => this.expireGroup(group), this.options.registrationTtlMs).unref(),
    };
    this.groups.add(group);
    if (body.isDev) {
      res.writeHead(200, { "content-type": "application/x-ndjson", "cache-control": "no-store" });
      res.flushHeaders();
      group.stream = res;
      res.on("close", () => {
        group.stream = undefined;
      });
    } else {
      sendJson(res, 200, { ok: true });
    }
    for (const key of body.fileKeys) {
      const registration: Registration = {
        key,
        metadata: body.metadata,
        isDev: body.isDev,
        callbackUrl: body.callbackUrl,
        callbackSlug: body.callbackSlug,
        awaitServerData: body.awaitServerData,
        group,
      };
      this.registrations.set(key, registration);
      const waiters = this.registrationWaiters.get(key);
      this.registrationWaiters.delete(key);
      for (const wake of waiters ?? []) wake(registration);
    }
  }

  registered(key: string): Registration | undefined {
    return this.registrations.get(key);
  }

  /** In dev mode the handler does not wait for `/route-metadata`, so the PUT may arrive first. */
  waitForRegistration(key: string): Promise<Registration | undefined> {
    const known = this.registrations.get(key);
    if (known) return Promise.resolve(known);
    return new Promise((resolve) => {
      const waiters = this.registrationWaiters.get(key) ?? new Set();
      const wake = (registration: Registration | undefined) => {
        clearTimeout(timer);
        waiters.delete(wake);
        resolve(registration);
      };
      const timer = setTimeout(() => wake(undefined), this.options.metadataWaitMs).unref();
      waiters.add(wake);
      this.registrationWaiters.set(key, waiters);
    });
  }

  /** Sends the completion callback; resolves to the app's `serverData` when it is awaited, else null. */
  async complete(registration: Registration, file: UploadedFileData): Promise<unknown> {
    const payload = JSON.stringify({ status: "uploaded", file, origin: this.options.origin, metadata: registration.metadata });
    const result = registration.awaitServerData ? this.expectResult(file.key) : undefined;
    // An unawaited result must not surface as an unhandled rejection if delivery fails first.
    result?.catch(() => undefined);
    try {
      const delivery = this.deliver(registration, "callback", payload);
      if (!result) {
        delivery.catch((error: unknown) => this.options.log(`callback for ${file.key} failed: ${messageOf(error)}`));
        return null;
      }
      await delivery;
      return await result;
    } catch (error) {
      this.settleResult(file.key, undefined, error instanceof Error ? error : new Error(String(error)));
      throw error;
    } finally {
      this.finish(registration);
    }
  }

  /**
   * Tells the app an upload attempt failed, so its `onUploadError` runs. The registration stays,
   * because the browser may retry the same presigned URL.
   */
  fail(registration: Registration, error: string): void {
    const payload = JSON.stringify({ fileKey: registration.key, error });
    this.deliver(registration, "error", payload).catch((deliveryError: unknown) =>
      this.options.log(`error hook for ${registration.key} failed: ${messageOf(deliveryError)}`),
    );
  }

  acceptResult(body: z.output<typeof CallbackResultSchema>): void {
    if ("error" in body) {
      this.settleResult(body.fileKey, undefined, new HttpError(502, `The app could not process the upload callback: ${body.error}`));
    } else {
      this.settleResult(body.fileKey, body.callbackData ?? null, undefined);
    }
  }

  close(): void {
    for (const group of this.groups) {
      clearTimeout(group.timer);
      group.stream?.end();
    }
    this.groups.clear();
    this.registrations.clear();
    for (const [key, waiters] of this.registrationWaiters) {
      this.registrationWaiters.delete(key);
      for (const wake of waiters) wake(undefined);
    }
    for (const key of [...this.results.keys()]) {
      this.settleResult(key, undefined, new HttpError(503, "The upload fake is shutting down"));
    }
  }

  private async deliver(registration: Registration, hook: "callback" | "error", payload: string): Promise<void> {
    const signature = signPayload(payload, this.options.apiKey);
    if (registration.isDev) {
      const stream = registration.group.stream;
      if (!stream || stream.writableEnded) {
        throw new HttpError(502, "The app's dev-mode callback stream is closed; the upload was stored but the app was not told");
      }
      stream.write(`${JSON.stringify({ payload, signature, hook })}\n`);
      return;
    }
    const target = new URL(registration.callbackUrl);
    target.searchParams.set("slug", registration.callbackSlug);
    let response: Response;
    try {
      response = await fetch(target, {
        method: "POST",
        headers: { "content-type": "application/json", "uploadthing-hook": hook, "x-uploadthing-signature": signature },
        body: payload,
      });
    } catch (error) {
      throw new HttpError(502, `Could not reach the app's callback URL ${target.origin}${target.pathname}: ${messageOf(error)}`);
    }
    await response.arrayBuffer();
    if (!response.ok) throw new HttpError(502, `The app answered the upload callback with HTTP ${response.status}`);
  }

  private expectResult(key: string): Promise<unknown> {
    return new Promise((resolve, reject) => {
      const seconds = Math.round(this.options.callbackWaitMs / 1000);
      const timer = setTimeout(
        () => this.settleResult(key, undefined, new HttpError(504, `The app sent no callback result within ${seconds} s`)),
        this.options.callbackWaitMs,
      ).unref();
      this.results.set(key, { resolve, reject, timer });
    });
  }

  private settleResult(key: string, value: unknown, error: Error | undefined): void {
    const pending = this.results.get(key);
    if (!pending) return;
    this.results.delete(key);
    clearTimeout(pending.timer);
    if (error) pending.reject(error);
    else pending.resolve(value);
  }

  private finish(registration: Registration): void {
    if (this.registrations.get(registration.key) === registration) this.registrations.delete(registration.key);
    const group = registration.group;
    group.pending.delete(registration.key);
    if (group.pending.size === 0) this.closeGroup(group);
  }

  private expireGroup(group: RegistrationGroup): void {
    for (const key of group.pending) {
      if (this.registrations.get(key)?.group === group) this.registrations.delete(key);
    }
    this.closeGroup(group);
  }

  private closeGroup(group: RegistrationGroup): void {
    clearTimeout(group.timer);
    group.stream?.end();
    this.groups.delete(group);
  }
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
