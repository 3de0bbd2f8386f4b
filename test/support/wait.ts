/** Polls `probe` until it returns a value: tests wait on states, never on fixed sleeps (the bound only turns a hang into a failure). */
export async function waitFor<T>(what: string, probe: () => Promise<T | undefined>, boundMs = 120_000): Promise<T> {
  const until = Date.now() + boundMs;
  for (;;) {
    const v = await probe();
    if (v !== undefined) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}
