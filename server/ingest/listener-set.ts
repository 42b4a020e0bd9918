/**
 * A set of listeners called in order, each in its own try/catch so that one throwing
 * does not stop the others (signalk-server's deltachain isolates its handlers the same
 * way). A fault is reported once per listener to `onFault`, not once per frame.
 */
export class ListenerSet<Args extends unknown[]> {
  private readonly listeners = new Map<(...args: Args) => void, { faulted: boolean }>();

  constructor(private readonly onFault: (err: unknown) => void = () => undefined) {}

  /** Adds a listener; returns its removal. */
  add(listener: (...args: Args) => void): () => void {
    this.listeners.set(listener, { faulted: false });
    return () => this.listeners.delete(listener);
  }

  /** Calls every listener with the arguments. */
  emit(...args: Args): void {
    for (const [listener, state] of this.listeners) {
      try {
        listener(...args);
      } catch (err) {
        if (!state.faulted) this.onFault(err);
        state.faulted = true;
      }
    }
  }

  get size(): number {
    return this.listeners.size;
  }
}
