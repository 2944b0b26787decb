/**
 * Numbers in finding messages: the presentation module's message figures (libs/presentation), with the SI display
 * units a message uses (MPa for stress, N·m for torque). Locale-independent, so a message is the same on every server.
 */
import { MESSAGE_FIGURES, messageNumber, messagePair } from '@leadline/presentation';

/** Default number of significant figures in messages. */
export const SIGNIFICANT_FIGURES = MESSAGE_FIGURES;

/** A value to `digits` significant figures; not-a-number spelled out, so a message never shows "NaN". */
export const sig = messageNumber;

/** A measured value and its limit with enough figures that they read differently whenever they differ. */
export const sigPair = messagePair;

const MPA = 1e6;

/** Stress or pressure [Pa] as "123 MPa". */
export function mpa(pa: number, digits?: number): string {
  return `${sig(pa / MPA, digits)} MPa`;
}

/** Torque [N*m] as "12.3 N·m". */
export function newtonMetres(torque: number, digits?: number): string {
  return `${sig(torque, digits)} N·m`;
}

/** Rotational speed [rev/min] as "1230 rev/min". */
export function revPerMin(rpm: number, digits?: number): string {
  return `${sig(rpm, digits)} rev/min`;
}

/** pV [Pa*m/s] as "0.716 MPa·m/s". */
export function mpaMetresPerSecond(pv: number, digits?: number): string {
  return `${sig(pv / MPA, digits)} MPa·m/s`;
}

/** A fraction as a percentage, "78.0 %". */
export function percent(fraction: number, digits?: number): string {
  return `${sig(fraction * 100, digits)} %`;
}
