/**
 * Physical constants used by the climate (radiative forcing) module. All SI unless the name says otherwise.
 */

/**
 * Total solar irradiance at 1 astronomical unit, W m⁻².
 * Kopp, G. & Lean, J. L. (2011), "A new, lower value of total solar irradiance: Evidence and climate
 * significance", Geophys. Res. Lett. 38, L01706: 1360.8 ± 0.5 W m⁻² at solar minimum, rounded to 1361.
 */
export const SOLAR_CONSTANT_WM2 = 1361

/**
 * Stefan–Boltzmann constant, W m⁻² K⁻⁴ (CODATA 2018; exact given the 2019 SI values of h, c and k).
 */
export const STEFAN_BOLTZMANN_WM2K4 = 5.670374419e-8

/**
 * Nominal effective temperature of the Sun, K (IAU 2015 Resolution B3: T_eff = 5772 K).
 */
export const SUN_EFFECTIVE_TEMPERATURE_K = 5772

/** Planck constant, J s (SI 2019, exact). */
export const PLANCK_CONSTANT_JS = 6.62607015e-34
/** Speed of light in vacuum, m s⁻¹ (exact). */
export const SPEED_OF_LIGHT_MS = 299792458
/** Boltzmann constant, J K⁻¹ (SI 2019, exact). */
export const BOLTZMANN_CONSTANT_JK = 1.380649e-23

/** Standard sea-level pressure, hPa. */
export const STANDARD_PRESSURE_HPA = 1013.25

/**
 * Default one-way transmittance of the atmosphere above the aerosol layer (T) and default cloud fraction
 * (A_c) for the global-mean screening estimate. Haywood, J. M. & Shine, K. P. (1995), Geophys. Res. Lett.
 * 22, 603–606 used T = 0.76 and A_c = 0.6 (values quoted from memory).
 */
export const DEFAULT_ATMOSPHERIC_TRANSMITTANCE = 0.76
export const DEFAULT_CLOUD_FRACTION = 0.6
