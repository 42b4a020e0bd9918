import type { Frame } from '../../shared/schemas/frame.js';

/** What the guard remembers between frames (stored with the run, so it survives a restart). */
export interface ClockGuardState {
  /** Added to the source's t, so a restarted meter clock continues the run's time line. */
  offsetSeconds: number;
  /** Last source t taken (before the offset). */
  lastT: number | null;
  /** Arrival time of that frame, Unix seconds. */
  lastArrivalSeconds: number | null;
  /** A frame that jumped in time, held until the next one says whether the jump was real. */
  suspect: Frame | null;
  suspectArrivalSeconds: number | null;
}

/** A guard with nothing seen yet. */
export function emptyClockState(): ClockGuardState {
  return { offsetSeconds: 0, lastT: null, lastArrivalSeconds: null, suspect: null, suspectArrivalSeconds: null };
}

/**
 * Keeps one bad timestamp from ruining a live run. The measurement core refuses a frame
 * whose time goes back, so a single frame stamped far ahead (a corrupted digit on the
 * wire) would make every later frame look old, and a meter whose clock restarts (power
 * cycled) would never be heard again. A step larger than `jumpSeconds` is held back: if the next
 * frame carries on from it (by less than the jump), the jump was real (a pause goes through and shows as a gap; a
 * restarted clock is shifted to carry on after the last reading, by the time that passed
 * on the server's clock); otherwise it was a glitch and is dropped.
 */
export class SourceClockGuard {
  constructor(
    private readonly jumpSeconds: number,
    readonly state: ClockGuardState = emptyClockState(),
  ) {}

  /** The frames to record for one arriving frame (none, one, or the held one and this one), on the run's time line. */
  accept(frame: Frame, arrivalSeconds: number): { frames: Frame[]; glitch: Frame | null } {
    const s = this.state;
    let glitch: Frame | null = null;
    if (s.lastT === null) return { frames: [this.take(frame, arrivalSeconds)], glitch };
    if (s.suspect) {
      const held = s.suspect;
      const heldArrival = s.suspectArrivalSeconds ?? arrivalSeconds;
      s.suspect = null;
      s.suspectArrivalSeconds = null;
      const step = frame.t - held.t;
      // Carrying on from the held frame by no more than its own jump: a glitch's neighbours sit on the old line.
      if (step > 0 && step <= Math.max(this.jumpSeconds, Math.abs(held.t - s.lastT))) {
        if (held.t < s.lastT) {
          // The meter's clock restarted: carry on from the last reading, as late as the server saw it come.
          const waitedSeconds = Math.max(step, heldArrival - (s.lastArrivalSeconds ?? heldArrival));
          s.offsetSeconds = s.lastT + s.offsetSeconds + waitedSeconds - held.t;
        }
        return { frames: [this.take(held, heldArrival), this.take(frame, arrivalSeconds)], glitch };
      }
      glitch = held;
    }
    const step = frame.t - s.lastT;
    if (Math.abs(step) > this.jumpSeconds) {
      s.suspect = frame;
      s.suspectArrivalSeconds = arrivalSeconds;
      return { frames: [], glitch };
    }
    // A small step back or a repeat goes on to the core, which refuses and counts it.
    return { frames: [step > 0 ? this.take(frame, arrivalSeconds) : this.shift(frame)], glitch };
  }

  /** Carries on after a reading replayed from disk (`runT` on the run's time line, as recorded). */
  resumeAfter(runT: number, arrivalSeconds: number): void {
    this.state.lastT = runT - this.state.offsetSeconds;
    this.state.lastArrivalSeconds = arrivalSeconds;
    this.state.suspect = null;
    this.state.suspectArrivalSeconds = null;
  }

  private take(frame: Frame, arrivalSeconds: number): Frame {
    this.state.lastT = frame.t;
    this.state.lastArrivalSeconds = arrivalSeconds;
    return this.shift(frame);
  }

  private shift(frame: Frame): Frame {
    return this.state.offsetSeconds === 0 ? frame : { ...frame, t: frame.t + this.state.offsetSeconds };
  }
}
