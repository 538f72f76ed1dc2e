/**
 * Physical constants used by the selectivity engine, all SI.
 *
 * The first three are exact by definition in the 2019 SI (CODATA 2018 recommended values).
 * Source: CODATA 2018, Tiesinga et al., Rev. Mod. Phys. 2021, 93, 025010.
 */

/** Boltzmann constant k_B in J/K (exact, CODATA 2018). */
export const BOLTZMANN_J_PER_K = 1.380649e-23;

/** Planck constant h in J·s (exact, CODATA 2018). */
export const PLANCK_J_S = 6.62607015e-34;

/** Avogadro constant N_A in 1/mol (exact, CODATA 2018). */
export const AVOGADRO_PER_MOL = 6.02214076e23;

/** Molar gas constant R = N_A·k_B in J/(mol·K) (exact product, 8.314462618… ). */
export const GAS_CONSTANT_J_PER_MOL_K = AVOGADRO_PER_MOL * BOLTZMANN_J_PER_K;

/** Thermochemical calorie in J (exact, NIST SP 811). */
export const THERMOCHEMICAL_CALORIE_J = 4.184;

/** Offset between the Celsius and Kelvin scales: T(K) = T(°C) + 273.15 (SI definition). */
export const CELSIUS_OFFSET_K = 273.15;

/** k_B/h in 1/(K·s): the Eyring–Polanyi pre-factor per kelvin. */
export const BOLTZMANN_OVER_PLANCK_PER_K_S = BOLTZMANN_J_PER_K / PLANCK_J_S;
