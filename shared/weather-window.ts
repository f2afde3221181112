// The worst weather over a window of work, computed once for the review, the crew day, the forecast
// summary and the briefing page. Pure: no imports.

/** One hour (or reading) of weather; a value the source left out is null. */
export interface WindowWeatherSample {
  temperatureC: number | null
  windKmh: number | null
  gustKmh?: number | null
}

/** Lowest air temperature, strongest sustained wind and strongest gust over a window. */
export interface WindowExtremes {
  coldestTemperatureC: number
  strongestWindKmh: number
  /** Null when no sample gives a gust figure. */
  strongestGustKmh: number | null
}

/**
 * The extremes over a window's samples, each taken on its own hour: the coldest air with the
 * strongest wind is the cautious pairing (it gives the lowest wind chill the window could hold).
 * Null when the samples give no temperature or no wind at all.
 */
export function findWindowExtremes(samples: readonly WindowWeatherSample[]): WindowExtremes | null {
  let coldest = Infinity
  let strongest = -Infinity
  let gust = -Infinity
  for (const s of samples) {
    if (s.temperatureC !== null && s.temperatureC < coldest) coldest = s.temperatureC
    if (s.windKmh !== null && s.windKmh > strongest) strongest = s.windKmh
    if (s.gustKmh !== undefined && s.gustKmh !== null && s.gustKmh > gust) gust = s.gustKmh
  }
  if (coldest === Infinity || strongest === -Infinity) return null
  return { coldestTemperatureC: coldest, strongestWindKmh: strongest, strongestGustKmh: gust === -Infinity ? null : gust }
}

/** The sample with the lowest score (e.g. its wind chill), the first of equals; null when no sample has a score. */
export function findLowestBy<T>(samples: readonly T[], score: (sample: T) => number | null): { sample: T, value: number } | null {
  let best: { sample: T, value: number } | null = null
  for (const sample of samples) {
    const value = score(sample)
    if (value !== null && (best === null || value < best.value)) best = { sample, value }
  }
  return best
}
