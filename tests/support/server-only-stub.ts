// Stand-in for the `server-only` marker package inside vitest (see tests/vitest.config.ts).
export {};
