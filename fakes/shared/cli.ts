/** Shared start-up for the fakes' command-line entries: one line when ready, clean close on SIGTERM/SIGINT. */
export function envPort(name: string, fallback: number): number {
  const text = process.env[name];
  const value = Number(text ?? String(fallback));
  if (!Number.isInteger(value) || value < 0 || value > 65535) throw new Error(`${name} is not a port number: ${text}`);
  return value;
}

export function runUntilSignal<T extends { close(): Promise<void> }>(name: string, start: () => Promise<T>, ready: (service: T) => string): void {
  const fail = (what: string, error: unknown) => {
    console.error(`${name} failed to ${what}: ${error instanceof Error ? error.message : String(error)}`);
    process.exit(1);
  };
  start().then((service) => {
    console.log(ready(service));
    const stop = () => {
      service.close().then(() => process.exit(0), (error: unknown) => fail("close", error));
    };
    process.once("SIGTERM", stop);
    process.once("SIGINT", stop);
  }, (error: unknown) => fail("start", error));
}
