import { describe, expect, it, vi } from 'vitest';
import { consoleLogger, createLogger, type Logger } from './logger.js';

describe('createLogger', () => {
  it('names its part of the server on every line and nests namespaces', () => {
    const lines: string[] = [];
    const sink: Logger = { info: (m) => lines.push(`info ${m}`), warn: (m) => lines.push(`warn ${m}`), error: (m) => lines.push(`error ${m}`) };
    const archive = createLogger('archive', sink);
    archive.info('batch written');
    createLogger('writer', archive).warn('database away');
    expect(lines).toEqual(['info [archive] batch written', 'warn [archive] [writer] database away']);
  });

  it('passes an Error through as the same object, so its stack is kept', () => {
    const seen: unknown[] = [];
    const sink: Logger = { info: () => undefined, warn: () => undefined, error: (_m, e) => seen.push(e) };
    const failure = new Error('disk full');
    createLogger('journal', sink).error('write failed', failure);
    expect(seen[0]).toBe(failure);
    expect((seen[0] as Error).stack).toContain('disk full');
  });

  it('writes to the console with the Error object itself (the console prints its stack)', () => {
    const spy = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const failure = new Error('socket closed');
    createLogger('live', consoleLogger).error('subscribe failed', failure);
    createLogger('live', consoleLogger).error('no detail');
    expect(spy.mock.calls).toEqual([['[live] subscribe failed', failure], ['[live] no detail']]);
    spy.mockRestore();
  });
});
