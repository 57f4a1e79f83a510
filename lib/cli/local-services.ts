/**
 * The local stand-ins for hosted services that `npm start` runs beside the app.
 * Filled in as each stand-in lands in fakes/.
 */
export interface LocalServices {
  env: Record<string, string>;
  close(): Promise<void>;
}

export async function startLocalServices(_dataRoot: string, _env: NodeJS.ProcessEnv): Promise<LocalServices> {
  return { env: {}, close: async () => undefined };
}

