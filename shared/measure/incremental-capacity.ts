/** One point of a discharge: terminal volts and Ah delivered so far (a Reading fits). */
export interface VoltChargePoint {
  volts: number;
  dischargeAh: number;
}

export interface IncrementalCapacityOptions {
  /** Width of a voltage bin, V. */
  binVolts?: number;
  /** Bins in the centred moving average that smooths the curve (odd; 1 = none). */
  smoothBins?: number;
}

const DEFAULT_BIN_VOLTS = 0.01;
const DEFAULT_SMOOTH_BINS = 5;

/** Centred moving average with a shrinking window at the ends. */
export function movingAverage(values: readonly number[], window: number): number[] {
  const half = Math.floor(window / 2);
  return values.map((_, i) => {
    const from = Math.max(0, i - half);
    const to = Math.min(values.length, i + half + 1);
    let sum = 0;
    for (let j = from; j < to; j++) sum += values[j]!;
    return sum / (to - from);
  });
}

/**
 * Incremental capacity dQ/dV of a discharge, in Ah per volt (positive), on a uniform voltage
 * grid: Q is read where the falling voltage (its running minimum, so noise cannot step it
 * back up) first reaches each grid edge, interpolated between readings; differences of Q
 * over the bin width give dQ/dV, then a moving average smooths it. Peaks mark the plateaus
 * of the discharge curve; a weak or aged pack shows them lower or shifted.
 */
export function incrementalCapacity(points: ArrayLike<VoltChargePoint>, options: IncrementalCapacityOptions = {}): { volts: number[]; dQdV: number[] } {
  const bin = options.binVolts ?? DEFAULT_BIN_VOLTS;
  if (!(bin > 0)) throw new RangeError('incrementalCapacity: binVolts must be positive');
  if (points.length < 2) return { volts: [], dQdV: [] };
  let floor = points[0]!.volts;
  // Edges from a whole-bin index so that repeated subtraction never drifts the grid.
  const firstEdgeIndex = Math.floor(floor / bin);
  let k = 0;
  let edge = firstEdgeIndex * bin;
  let prevV = floor;
  let prevQ = points[0]!.dischargeAh;
  const qAtEdge: number[] = [];
  const edges: number[] = [];
  for (let i = 1; i < points.length; i++) {
    const v = Math.min(floor, points[i]!.volts);
    const q = points[i]!.dischargeAh;
    while (v <= edge && prevV > v) {
      const f = (prevV - edge) / (prevV - v);
      edges.push(edge);
      qAtEdge.push(prevQ + f * (q - prevQ));
      k++;
      edge = (firstEdgeIndex - k) * bin;
    }
    floor = v;
    prevV = v;
    prevQ = q;
  }
  const raw: number[] = [];
  const centres: number[] = [];
  for (let i = 1; i < edges.length; i++) {
    raw.push((qAtEdge[i]! - qAtEdge[i - 1]!) / bin);
    centres.push((edges[i]! + edges[i - 1]!) / 2);
  }
  return { volts: centres, dQdV: movingAverage(raw, options.smoothBins ?? DEFAULT_SMOOTH_BINS) };
}
