/**
 * Angle readings as people write them off a spectrometer table: decimal degrees (9.43),
 * degrees and minutes (`9° 26'`, `9 26`, `9d26m`, `9:26`) and optionally seconds.
 * Also sexagesimal right ascension (`18h36m56s`) and declination (`+38d47m01s`).
 */

const DMS =
  /^\s*([+\-−]?)\s*(\d+(?:\.\d+)?)\s*(?:°|d|deg|:|\s)\s*(?:(\d+(?:\.\d+)?)\s*(?:'|′|m|min|:)?\s*(?:(\d+(?:\.\d+)?)\s*(?:"|″|''|s)?)?)?\s*$/i;

/** Degrees from a number or a degree–minute–second string; null when it cannot be read. */
export function parseAngleDeg(value: number | string): number | null {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  const trimmed = value.trim();
  if (/^[+-]?\d+(\.\d+)?°?$/.test(trimmed)) return Number(trimmed.replace('°', ''));
  const m = DMS.exec(trimmed);
  if (!m) return null;
  const sign = m[1] === '-' || m[1] === '−' ? -1 : 1;
  const deg = Number(m[2]);
  const min = m[3] === undefined ? 0 : Number(m[3]);
  const sec = m[4] === undefined ? 0 : Number(m[4]);
  if (min >= 60 || sec >= 60) return null;
  return sign * (deg + min / 60 + sec / 3600);
}

const HMS =
  /^\s*(\d+(?:\.\d+)?)\s*(?:h|:|\s)\s*(\d+(?:\.\d+)?)\s*(?:m|:|\s)?\s*(?:(\d+(?:\.\d+)?)\s*s?)?\s*$/i;

/** Right ascension in degrees from degrees (number) or an hours–minutes–seconds string. */
export function parseRightAscensionDeg(value: number | string): number | null {
  if (typeof value === 'number') return value >= 0 && value < 360 ? value : null;
  const m = HMS.exec(value);
  if (!m) return null;
  const h = Number(m[1]);
  const min = Number(m[2]);
  const sec = m[3] === undefined ? 0 : Number(m[3]);
  if (h >= 24 || min >= 60 || sec >= 60) return null;
  return (h + min / 60 + sec / 3600) * 15;
}

/** Declination in degrees from degrees (number) or a `+38d47m01s` / `+38° 47' 01"` string. */
export function parseDeclinationDeg(value: number | string): number | null {
  const deg = parseAngleDeg(value);
  return deg !== null && deg >= -90 && deg <= 90 ? deg : null;
}
