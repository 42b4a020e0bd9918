/** One point of the ambient profile. */
export interface AmbientPoint {
  atSeconds: number;
  tempCelsius: number;
}

/** Ambient temperature at time tS, linear between the profile's points and flat beyond them. */
export function ambientAt(profile: readonly AmbientPoint[], tS: number): number {
  const points = [...profile].sort((a, b) => a.atSeconds - b.atSeconds);
  if (tS <= points[0].atSeconds) return points[0].tempCelsius;
  for (let i = 1; i < points.length; i += 1) {
    const high = points[i];
    if (tS <= high.atSeconds) {
      const low = points[i - 1];
      return low.tempCelsius + ((high.tempCelsius - low.tempCelsius) * (tS - low.atSeconds)) / (high.atSeconds - low.atSeconds);
    }
  }
  return points[points.length - 1].tempCelsius;
}
