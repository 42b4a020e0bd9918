import { describe, expect, it } from 'vitest';
import { stepTemperature } from './thermal.js';

const params = { heatCapacityJPerK: 8000, toAmbientKPerW: 0.8 };

describe('lumped thermal model', () => {
  it('follows Newton\'s law of cooling: ambient + P·R, approached with time constant C·R', () => {
    // Analytic solution of C·dT/dt = P − (T − Ta)/R (first-order lumped model, any heat-transfer text).
    const heatWatts = 12.5;
    const tauSeconds = params.heatCapacityJPerK * params.toAmbientKPerW;
    let temp = 20;
    for (let t = 0; t < tauSeconds; t += 0.25) temp = stepTemperature(temp, 20, heatWatts, 0.25, params);
    const rise = heatWatts * params.toAmbientKPerW;
    expect(temp).toBeCloseTo(20 + rise * (1 - Math.exp(-1)), 6);
    for (let t = 0; t < 20 * tauSeconds; t += 10) temp = stepTemperature(temp, 20, heatWatts, 10, params);
    expect(temp).toBeCloseTo(20 + rise, 6);
  });

  it('a pack left in a cold chamber cools towards the chamber', () => {
    let temp = 25;
    for (let t = 0; t < 3600; t += 1) temp = stepTemperature(temp, -10, 0, 1, params);
    expect(temp).toBeLessThan(25);
    expect(temp).toBeGreaterThan(-10);
    expect(temp).toBeCloseTo(-10 + 35 * Math.exp(-3600 / 6400), 6);
  });
});
