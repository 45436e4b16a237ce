/** Method `wavelength`: the instrument already gives wavelengths; only units change. */

import { FWHM_PER_SIGMA, NM_PER_ANGSTROM, NM_PER_MICROMETRE } from '../../constants.js';
import type { Diagnostic } from '../../diagnostics.js';
import { positionOfField } from '../../session/normalize.js';
import type { Session, WavelengthUnit } from '../../session/types.js';
import type { MethodResult, ObservedReading } from '../types.js';

export const NM_PER_UNIT: Record<WavelengthUnit, number> = {
  nm: 1,
  angstrom: NM_PER_ANGSTROM,
  um: NM_PER_MICROMETRE,
};

const UNIT_SYMBOL: Record<WavelengthUnit, string> = { nm: 'nm', angstrom: 'Å', um: 'µm' };

/** Used when neither the line, the session nor the instrument says how good a reading is. */
export const FALLBACK_SIGMA_NM = 0.5;

export function reduceWavelengths(session: Session): MethodResult {
  const unit = session.measurement.unit;
  const scale = NM_PER_UNIT[unit];
  const diagnostics: Diagnostic[] = [];
  const fallback = defaultSigmaNm(session);
  if (fallback.assumed) {
    diagnostics.push({
      file: session.file,
      ...positionOfField(session, 'measurement.sigma'),
      severity: 'warning',
      code: 'assumed-sigma',
      field: 'measurement.sigma',
      message: `no reading uncertainty given; assuming ${fallback.sigma_nm} nm`,
      hint: 'set measurement.sigma (or instrument.resolution_nm) so the windows match your instrument',
    });
  }
  const readings: ObservedReading[] = session.lines.map((line) => {
    const value = line.wavelength ?? 0;
    const sigma_nm = line.sigma !== null ? line.sigma * scale : fallback.sigma_nm;
    return {
      index: line.index,
      wavelength_nm: value * scale,
      sigma_nm,
      reading_text: `${value} ${UNIT_SYMBOL[unit]}`,
    };
  });
  return {
    readings,
    calibration: null,
    description: {
      formula: unit === 'nm' ? 'λ as read' : `λ[nm] = λ[${UNIT_SYMBOL[unit]}] × ${scale}`,
      text: `Wavelengths were read directly from a calibrated instrument in ${UNIT_SYMBOL[unit]}${unit === 'nm' ? '' : ' and converted to nm'}.`,
    },
    diagnostics,
  };
}

function defaultSigmaNm(session: Session): { sigma_nm: number; assumed: boolean } {
  const scale = NM_PER_UNIT[session.measurement.unit];
  if (session.measurement.sigma !== null)
    return { sigma_nm: session.measurement.sigma * scale, assumed: false };
  const fwhm = session.instrument.resolution_nm;
  if (fwhm !== null) return { sigma_nm: fwhm / FWHM_PER_SIGMA, assumed: false };
  const allGiven = session.lines.every((l) => l.sigma !== null);
  return { sigma_nm: FALLBACK_SIGMA_NM, assumed: !allGiven };
}
