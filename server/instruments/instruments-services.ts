import type { FrameCorrector } from './frame-corrector.js';

declare module '../app-context.js' {
  interface AppServices {
    /** The meters' calibration as applied to frames; routes reload it after a record changes. */
    instruments: { corrector: FrameCorrector; reload(): Promise<void> };
  }
}
