import type { Browser } from "playwright-core";
import { afterAll, beforeAll } from "vitest";
import { startAppServer, type AppServer } from "./app-server";
import { openBrowser } from "./browser";

export interface AppAndBrowser {
  readonly app: AppServer;
  readonly browser: Browser;
}

/**
 * One built app server (demo data, fresh data directory) and one Chromium for a whole test file:
 * started before its first test, stopped after its last. Call at the top level of the file.
 */
export function appAndBrowser(extraEnv: Record<string, string> = {}): AppAndBrowser {
  const held: { app?: AppServer; browser?: Browser } = {};
  beforeAll(async () => {
    held.app = await startAppServer(extraEnv);
    held.browser = await openBrowser();
  });
  afterAll(async () => {
    await held.browser?.close();
    await held.app?.stop();
  });
  const started = <T>(value: T | undefined, what: string): T => {
    if (value === undefined) throw new Error(`The ${what} is not started yet: use it inside a test or hook.`);
    return value;
  };
  return {
    get app() {
      return started(held.app, "app server");
    },
    get browser() {
      return started(held.browser, "browser");
    },
  };
}
