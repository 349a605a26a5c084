/**
 * Background work inside the server process (study runs). Each job is a promise; `idle()` resolves when none is left
 * (tests and graceful shutdown wait on it). State lives in the database, so a client can leave and come back.
 */
export class Jobs {
  private readonly running = new Set<Promise<void>>();

  start(job: () => Promise<void>): void {
    const p = Promise.resolve()
      .then(job)
      .catch((e: unknown) => console.error('background job failed', e))
      .finally(() => this.running.delete(p));
    this.running.add(p);
  }

  async idle(): Promise<void> {
    while (this.running.size) await Promise.all([...this.running]);
  }

  get size(): number {
    return this.running.size;
  }
}

/** Lets the event loop breathe between chunks of a long computation. */
export const yieldToLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));
