/*
 * units.h — temperature scales and spectral coordinates.
 *
 * Temperatures: kelvin (K), degrees Celsius (C), degrees Fahrenheit (F).
 * Absolute temperatures are converted with their offsets (ITS-90 relation
 * t/C = T/K - 273.15; t/F = 1.8 t/C + 32); temperature *differences*
 * (uncertainties, errors, sensitivities per kelvin) scale only.
 *
 * Spectral positions: wavelength in um, nm or m; wavenumber in cm^-1;
 * frequency in THz or Hz.  All conversions are exact up to one or two
 * roundings (relative error <= 2 ulp).
 */
#ifndef GREYBODY_UNITS_H
#define GREYBODY_UNITS_H

#include "status.h"

typedef enum gb_temperature_unit {
    GB_KELVIN = 0,
    GB_CELSIUS,
    GB_FAHRENHEIT
} gb_temperature_unit;

typedef enum gb_wavelength_unit {
    GB_MICROMETRE = 0,
    GB_NANOMETRE,
    GB_METRE
} gb_wavelength_unit;

/* Parse "K", "C" or "F" (also "degC", "degF"); GB_ERR_INVALID_ARGUMENT otherwise. */
gb_status gb_temperature_unit_parse(const char *text, gb_temperature_unit *unit);
/* The canonical symbol: "K", "C" or "F". */
const char *gb_temperature_unit_symbol(gb_temperature_unit unit);

/* Parse "um" (also "µm", "micrometre"), "nm" or "m". */
gb_status gb_wavelength_unit_parse(const char *text, gb_wavelength_unit *unit);
const char *gb_wavelength_unit_symbol(gb_wavelength_unit unit);
/* How many of `unit` make one micrometre (1, 1000, 1e-6). */
double gb_wavelength_unit_per_micrometre(gb_wavelength_unit unit);

/*
 * Absolute temperature in `unit` -> kelvin.  Fails with GB_ERR_NOT_FINITE for
 * NaN/inf and GB_ERR_TEMPERATURE_DOMAIN when the result is not in
 * (0, GB_TEMPERATURE_MAX] K.
 */
gb_status gb_temperature_to_kelvin(double value, gb_temperature_unit unit, double *kelvin);
/* Kelvin -> absolute temperature in `unit`.  Fails only for non-finite input. */
gb_status gb_temperature_from_kelvin(double kelvin, gb_temperature_unit unit, double *value);

/* A temperature difference (kelvin-sized) <-> `unit`-sized: x1 for K and C, x1.8 for F. */
gb_status gb_temperature_difference_to_kelvin(double value, gb_temperature_unit unit,
                                              double *kelvin);
gb_status gb_temperature_difference_from_kelvin(double kelvin, gb_temperature_unit unit,
                                                double *value);

/* Wavelength in `unit` -> micrometres; must be finite and > 0. */
gb_status gb_wavelength_to_micrometres(double value, gb_wavelength_unit unit, double *micrometres);
/* Wavenumber (cm^-1) <-> wavelength (um): lambda = 1e4 / nu~.  Must be finite and > 0. */
gb_status gb_wavenumber_to_wavelength(double wavenumber_cm, double *wavelength_um);
gb_status gb_wavelength_to_wavenumber(double wavelength_um, double *wavenumber_cm);
/* Frequency (Hz) <-> wavelength (um): lambda = c / nu. */
gb_status gb_frequency_to_wavelength(double frequency_hz, double *wavelength_um);
gb_status gb_wavelength_to_frequency(double wavelength_um, double *frequency_hz);

#endif
