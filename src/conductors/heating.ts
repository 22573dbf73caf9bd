/**
 * Adiabatic heating of a conductor by a current pulse: the action integral ∫I²dt through a cross-section A
 * raises the temperature from T_a to T when ∫I²dt / A² = g(T) with
 *   g(T) = ∫ γ c / ρ(T′) dT′,   ρ(T) = ρ20·(1 + α (T − 20 °C)),   c constant
 *        = γ c / (ρ20 α) · ln[(1 + α (T − 20)) / (1 + α (T_a − 20))]        [derived]
 * No heat leaves the conductor during the pulse (adiabatic), which is the usual and conservative view for
 * millisecond pulses. Temperatures in °C, specific action in A²·s/m⁴.
 */
import type { Material } from './materials.js';

/** Room temperature assumed when a scenario does not give one (°C). */
export const DEFAULT_AMBIENT = 20;

/** Specific action (∫I²dt/A²) that heats the material from `ambient` to `temperature` (both °C). */
export function specificActionToTemperature(material: Material, temperature: number, ambient = DEFAULT_AMBIENT): number {
  const { density, specificHeat, resistivity, temperatureCoefficient: alpha } = material;
  const ratio = (1 + alpha * (temperature - 20)) / (1 + alpha * (ambient - 20));
  return ((density * specificHeat) / (resistivity * alpha)) * Math.log(ratio);
}

/**
 * Specific action to the onset of melting (melting point or solidus), without the latent heat: the figure
 * Onderdonk's fusing equation gives for copper, and the limit the checks use.
 */
export function meltingAction(material: Material, ambient = DEFAULT_AMBIENT): number {
  return specificActionToTemperature(material, material.meltingTemperature, ambient);
}

/**
 * The further specific action to melt the material through, γ·L_f / ρ(T_m), with the resistivity held at
 * the solid value at the melting point. Liquid metals conduct worse (copper about half as well), so this
 * overstates the latent part; it is shown for information only, never used as a limit.
 */
export function fusionAction(material: Material): number {
  const meltResistivity = material.resistivity * (1 + material.temperatureCoefficient * (material.meltingTemperature - 20));
  return (material.density * material.latentHeat) / meltResistivity;
}

/** Temperature (°C) reached by an adiabatic conductor after the given specific action, from `ambient`. */
export function temperatureAfterAction(material: Material, specificAction: number, ambient = DEFAULT_AMBIENT): number {
  const { density, specificHeat, resistivity, temperatureCoefficient: alpha } = material;
  const growth = Math.exp((specificAction * resistivity * alpha) / (density * specificHeat));
  return 20 + ((1 + alpha * (ambient - 20)) * growth - 1) / alpha;
}
