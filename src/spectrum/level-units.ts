/**
 * Receiver levels in the units scan files use, to and from dBµV (the unit every scan is held in).
 *
 * The arithmetic (textbook):
 * - dBµV = 20·log10(V / 1 µV), so 1 V = 20·log10(10⁶) = 120 dBµV and dBµV = dBV + 120.
 * - dBm in a 50 Ω system: P = V²/R, so a power of 1 mW is V² = 50 Ω · 1 mW and
 *   dBµV − dBm = 10·log10(50 Ω · 10⁻³ W / (10⁻⁶ V)²) = 10·log10(5·10¹⁰)
 *              = 10·log10(50·1000) + 60 = 46.99 + 60 = 106.99 dB.
 *   The 50 Ω is the receiver's input impedance; a dBm figure from a system of another impedance is
 *   not this, and the reader says which impedance it assumed.
 * - dBµA read through a transfer impedance Z_T (a current probe's, or the impedance the current is
 *   taken to flow in): V = Z_T · I, so dBµV = dBµA + 20·log10(Z_T / 1 Ω); 50 Ω adds 33.98 dB.
 * - Volts are an rms reading (what a receiver shows for a sine), not a Fourier peak amplitude.
 *
 * Everything is a pure function of numbers. Linear volts at or below zero have no dB value and come
 * back as −Infinity or NaN, which a reader must refuse; the scan reader does (it rejects the line).
 */

/** The level units a scan may arrive in, each under its own canonical spelling. */
export const LEVEL_UNITS = ['dBµV', 'dBm', 'dBµA', 'V', 'dBV'] as const;
export type LevelUnit = (typeof LEVEL_UNITS)[number];

/** ASCII spellings ("u" for "µ") accepted wherever a unit is named, with the unit they stand for. */
export const LEVEL_UNIT_ALIASES: Readonly<Record<'dBuV' | 'dBuA', LevelUnit>> = { dBuV: 'dBµV', dBuA: 'dBµA' };
/** Every name a caller may give a level unit by. */
export const LEVEL_UNIT_NAMES = [...LEVEL_UNITS, 'dBuV', 'dBuA'] as const;
export type LevelUnitName = (typeof LEVEL_UNIT_NAMES)[number];

/** The impedance a dBm reading refers to: the receiver's 50 Ω input. */
export const DBM_REFERENCE_OHM = 50;

/** dBµV minus dBm in 50 Ω: 10·log10(50 Ω · 1 mW / (1 µV)²) = 106.9897… dB. */
export const DBUV_MINUS_DBM_50_OHM = 10 * Math.log10((DBM_REFERENCE_OHM * 1e-3) / 1e-12);

/** dBµV minus dBV: 20·log10(1 V / 1 µV) = 120 dB. */
export const DBUV_MINUS_DBV = 120;

/** The canonical unit for a name ("dBuV" → "dBµV"); a canonical name is returned as it is. */
export function canonicalLevelUnit(name: LevelUnitName): LevelUnit {
  return name === 'dBuV' || name === 'dBuA' ? LEVEL_UNIT_ALIASES[name] : name;
}

/** Whether a level in this unit needs a transfer impedance to become a voltage. */
export function needsTransferImpedance(unit: LevelUnitName): boolean {
  return canonicalLevelUnit(unit) === 'dBµA';
}

/** 20·log10(Z / 1 Ω): an impedance in dBΩ (50 Ω → 33.98 dBΩ). */
export function ohmToDbOhm(impedanceOhm: number): number {
  return 20 * Math.log10(impedanceOhm);
}

export function dbmToDbuV(dBm: number): number {
  return dBm + DBUV_MINUS_DBM_50_OHM;
}

export function dbuVToDbm(dBuV: number): number {
  return dBuV - DBUV_MINUS_DBM_50_OHM;
}

export function dbVToDbuV(dBV: number): number {
  return dBV + DBUV_MINUS_DBV;
}

export function dbuVToDbV(dBuV: number): number {
  return dBuV - DBUV_MINUS_DBV;
}

/** An rms voltage to dBµV; zero or less has no dB value (−Infinity or NaN). */
export function voltsToDbuV(volts: number): number {
  return 20 * Math.log10(volts) + DBUV_MINUS_DBV;
}

export function dbuVToVolts(dBuV: number): number {
  return 10 ** ((dBuV - DBUV_MINUS_DBV) / 20);
}

/** A current in dBµA to the voltage it develops across `transferImpedanceOhm`, in dBµV. */
export function dbuAToDbuV(dBuA: number, transferImpedanceOhm: number): number {
  return dBuA + ohmToDbOhm(checkedTransferImpedance(transferImpedanceOhm));
}

export function dbuVToDbuA(dBuV: number, transferImpedanceOhm: number): number {
  return dBuV - ohmToDbOhm(checkedTransferImpedance(transferImpedanceOhm));
}

/**
 * A level in `unit` to dBµV. `transferImpedanceOhm` is needed for dBµA only and ignored otherwise;
 * a missing or non-positive one for dBµA is a programming error (readers check options first).
 */
export function levelToDbuV(value: number, unit: LevelUnitName, transferImpedanceOhm?: number): number {
  const canonical = canonicalLevelUnit(unit);
  switch (canonical) {
    case 'dBµV':
      return value;
    case 'dBm':
      return dbmToDbuV(value);
    case 'dBµA':
      return dbuAToDbuV(value, requireTransferImpedance(transferImpedanceOhm));
    case 'V':
      return voltsToDbuV(value);
    case 'dBV':
      return dbVToDbuV(value);
  }
}

/** A level in dBµV to `unit`: the inverse of levelToDbuV. */
export function levelFromDbuV(dBuV: number, unit: LevelUnitName, transferImpedanceOhm?: number): number {
  const canonical = canonicalLevelUnit(unit);
  switch (canonical) {
    case 'dBµV':
      return dBuV;
    case 'dBm':
      return dbuVToDbm(dBuV);
    case 'dBµA':
      return dbuVToDbuA(dBuV, requireTransferImpedance(transferImpedanceOhm));
    case 'V':
      return dbuVToVolts(dBuV);
    case 'dBV':
      return dbuVToDbV(dBuV);
  }
}

/**
 * For the units that are logarithmic: the dB added to a reading to make it dBµV. Undefined for
 * volts, which are converted by a logarithm, not an offset.
 */
export function dbOffsetToDbuV(unit: LevelUnitName, transferImpedanceOhm?: number): number | undefined {
  return canonicalLevelUnit(unit) === 'V' ? undefined : levelToDbuV(0, unit, transferImpedanceOhm);
}

function requireTransferImpedance(transferImpedanceOhm: number | undefined): number {
  if (transferImpedanceOhm === undefined) throw new RangeError('a level in dBµA needs a transfer impedance in Ω');
  return transferImpedanceOhm;
}

function checkedTransferImpedance(transferImpedanceOhm: number): number {
  if (!(transferImpedanceOhm > 0) || !Number.isFinite(transferImpedanceOhm)) {
    throw new RangeError(`a transfer impedance must be a positive number of ohms, got ${transferImpedanceOhm}`);
  }
  return transferImpedanceOhm;
}
