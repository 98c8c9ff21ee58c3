/*
 * constants.h — physical constants of radiometry.
 *
 * Source: CODATA 2018 (NIST), with h, c and k exact by the 2019 SI
 * definitions; everything derived below was computed at 30 significant digits
 * with mpmath from those exact values (see tests/reference/generate.py, which
 * recomputes and checks each one) and rounded to the nearest double.
 */
#ifndef GREYBODY_CONSTANTS_H
#define GREYBODY_CONSTANTS_H

#define GB_PLANCK_H 6.62607015e-34     /* J s, exact */
#define GB_SPEED_OF_LIGHT 299792458.0  /* m s^-1, exact */
#define GB_BOLTZMANN_K 1.380649e-23    /* J K^-1, exact */

/* First radiation constant for radiance, c1L = 2 h c^2, W m^2 sr^-1. */
#define GB_C1L 1.19104297239718841407948920e-16
/* c1L expressed for wavelengths in micrometres: W um^4 m^-2 sr^-1. */
#define GB_C1L_UM 1.19104297239718841407948920e8
/* Second radiation constant c2 = h c / k, m K and um K. */
#define GB_C2 1.438776877503933802147e-2
#define GB_C2_UM 14387.76877503933802147
/* Stefan-Boltzmann constant sigma = 2 pi^5 k^4 / (15 h^3 c^2), W m^-2 K^-4. */
#define GB_SIGMA 5.670374419184429454e-8
/* Photon Stefan-Boltzmann constant 4 pi zeta(3) k^3 / (h^3 c^2), s^-1 m^-2 K^-3. */
#define GB_SIGMA_PHOTON 1.520460859393136211282446e15

/* Roots of x = q (1 - e^-x): x_q = q + W0(-q e^-q). */
#define GB_WIEN_X5 4.96511423174427630369875913132 /* radiance per wavelength */
#define GB_WIEN_X4 3.92069039487288634356089135261 /* photon radiance per wavelength */
#define GB_WIEN_X3 2.82143937212207889340319133029 /* radiance per frequency or wavenumber */
#define GB_WIEN_X2 1.59362426004004009232304187588 /* photon radiance per frequency */

/* Wien displacement constants. */
#define GB_WIEN_WAVELENGTH_UM_K 2897.771955185172661         /* c2 / x5, um K */
#define GB_WIEN_PHOTON_WAVELENGTH_UM_K 3669.702865050074266496195    /* c2 / x4, um K */
#define GB_WIEN_FREQUENCY_HZ_PER_K 5.878925757646824947e10   /* x3 k / h, Hz K^-1 */
#define GB_WIEN_WAVENUMBER_CM_PER_K 1.960998551086573681     /* x3 / c2, cm^-1 K^-1 */

/* Series constants: 15 / pi^4, 1 / (2 zeta(3)), pi. */
#define GB_FIFTEEN_OVER_PI4 0.153989733820265027837291749007
#define GB_HALF_INVERSE_ZETA3 0.415953686290353734341563139411
#define GB_PI 3.14159265358979323846264338328

/* The temperature domain every core function accepts: (0, GB_TEMPERATURE_MAX] K. */
#define GB_TEMPERATURE_MAX 1e9

#endif
