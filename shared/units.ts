// Cold and wind figures in a person's units (metric: °C, km/h, m; imperial: °F, mph, ft). Stored and
// computed figures are metric; these only convert for display. Pure.
import { formatSigned } from './review'

export type FigureUnits = 'metric' | 'imperial'

export const KMH_PER_MPH = 1.609344
const M_PER_FT = 0.3048

/** °C → °F. */
export function toFahrenheit(celsius: number): number {
  return celsius * 9 / 5 + 32
}

/** km/h → mph. */
export function toMph(kmh: number): number {
  return kmh / KMH_PER_MPH
}

/** m → ft. */
export function toFeet(metres: number): number {
  return metres / M_PER_FT
}

/** ft → m (for figures entered in feet). */
export function fromFeet(feet: number): number {
  return feet * M_PER_FT
}

/** The symbols a person's units print: `°C`, `km/h`, `m` or `°F`, `mph`, `ft`. */
export const UNIT_SYMBOLS: Record<FigureUnits, { temperature: string, wind: string, distance: string }> = {
  metric: { temperature: '°C', wind: 'km/h', distance: 'm' },
  imperial: { temperature: '°F', wind: 'mph', distance: 'ft' }
}

/** `−28 °C` or `−18 °F`; an em dash for no value. */
export function formatTemperature(celsius: number | null, units: FigureUnits): string {
  if (celsius === null) return '—'
  return units === 'imperial' ? `${formatSigned(toFahrenheit(celsius))} °F` : `${formatSigned(celsius)} °C`
}

/** `40 km/h` or `25 mph`; an em dash for no value. */
export function formatWind(kmh: number | null, units: FigureUnits): string {
  if (kmh === null) return '—'
  return units === 'imperial' ? `${Math.round(toMph(kmh))} mph` : `${Math.round(kmh)} km/h`
}

/** `200 m` or `656 ft`; an em dash for no value. */
export function formatVisibility(metres: number | null, units: FigureUnits): string {
  if (metres === null) return '—'
  return units === 'imperial' ? `${Math.round(toFeet(metres))} ft` : `${Math.round(metres)} m`
}

/** A site's elevation: `812 m` or `2664 ft`, below sea level with a true minus sign; em dash for none. */
export function formatElevation(metres: number | null, units: FigureUnits): string {
  if (metres === null) return '—'
  return units === 'imperial' ? `${formatSigned(toFeet(metres))} ft` : `${formatSigned(metres)} m`
}
