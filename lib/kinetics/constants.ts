/**
 * Physical constants used by the kinetics engine.
 *
 * Source: CODATA 2018 recommended values (SI exact since the 2019 redefinition),
 * https://physics.nist.gov/cuu/Constants/ — R is the exact product N_A·k_B.
 */

/** Avogadro constant N_A, mol⁻¹ (exact). */
export const AVOGADRO = 6.02214076e23;

/** Boltzmann constant k_B, J K⁻¹ (exact). */
export const BOLTZMANN = 1.380649e-23;

/** Planck constant h, J s (exact). */
export const PLANCK = 6.62607015e-34;

/** Molar gas constant R = N_A·k_B, J mol⁻¹ K⁻¹ (exact, rounded to double). */
export const GAS_CONSTANT = 8.31446261815324;

/** Elementary charge e, C (exact); used for eV ↔ J mol⁻¹. */
export const ELEMENTARY_CHARGE = 1.602176634e-19;

/** Speed of light in vacuum c, m s⁻¹ (exact); used for cm⁻¹ ↔ J mol⁻¹. */
export const SPEED_OF_LIGHT = 299792458;

/** Thermochemical calorie, J (exact by definition, ISO 80000-5). */
export const CALORIE = 4.184;

/** Standard atmosphere, Pa (exact by definition). */
export const STANDARD_ATMOSPHERE = 101325;

/** Reference temperature for k(298) and the default T0 of modified Arrhenius, K. */
export const REFERENCE_TEMPERATURE = 298.15;

/** Zero of the Celsius scale, K (exact by definition). */
export const CELSIUS_ZERO = 273.15;

/** ln(k_B/h) in ln(s⁻¹ K⁻¹): the constant term of the Eyring equation. */
export const LN_BOLTZMANN_OVER_PLANCK = Math.log(BOLTZMANN / PLANCK);
