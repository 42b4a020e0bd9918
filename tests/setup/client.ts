import { configure } from '@testing-library/dom';
import { cleanup } from '@testing-library/react';
import { afterEach, vi } from 'vitest';

// uPlot draws on a canvas, which happy-dom does not have: a stand-in records what it is given.
vi.mock('uplot', () => {
  class FakePlot {
    static instances: FakePlot[] = [];
    /** Enough of uPlot.join for tests: tables that share one x column. */
    static join(tables: number[][][]) {
      return [tables[0][0], ...tables.flatMap((t) => t.slice(1))];
    }
    opts: unknown;
    data: unknown;
    setDataCalls = 0;
    constructor(opts: unknown, data: unknown) {
      this.opts = opts;
      this.data = data;
      FakePlot.instances.push(this);
    }
    setData(data: unknown) {
      this.data = data;
      this.setDataCalls++;
    }
    scaleCalls: { key: string; limits: unknown }[] = [];
    redrawCalls = 0;
    setScale(key: string, limits: unknown) {
      this.scaleCalls.push({ key, limits });
    }
    redraw() {
      this.redrawCalls++;
    }
    setSize() {}
    setSelect() {}
    destroy() {}
  }
  return { default: FakePlot };
});

// The first test of a file loads the lazy route chunks; on a busy 2-core CI machine that can
// pass the library's 1 s default for findBy/waitFor, failing a test that is right.
configure({ asyncUtilTimeout: 3_000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});
