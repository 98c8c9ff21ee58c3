#include "units.h"

#include <math.h>
#include <string.h>

#include "constants.h"

#define CELSIUS_OFFSET 273.15
#define FAHRENHEIT_PER_KELVIN 1.8
#define FAHRENHEIT_ZERO_IN_CELSIUS_SCALE 32.0

gb_status gb_temperature_unit_parse(const char *text, gb_temperature_unit *unit)
{
    if (text == NULL || unit == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (strcmp(text, "K") == 0) {
        *unit = GB_KELVIN;
    } else if (strcmp(text, "C") == 0 || strcmp(text, "degC") == 0) {
        *unit = GB_CELSIUS;
    } else if (strcmp(text, "F") == 0 || strcmp(text, "degF") == 0) {
        *unit = GB_FAHRENHEIT;
    } else {
        return GB_ERR_INVALID_ARGUMENT;
    }
    return GB_OK;
}

const char *gb_temperature_unit_symbol(gb_temperature_unit unit)
{
    switch (unit) {
    case GB_CELSIUS: return "C";
    case GB_FAHRENHEIT: return "F";
    case GB_KELVIN: break;
    }
    return "K";
}

gb_status gb_wavelength_unit_parse(const char *text, gb_wavelength_unit *unit)
{
    if (text == NULL || unit == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (strcmp(text, "um") == 0 || strcmp(text, "\xC2\xB5m") == 0 ||
        strcmp(text, "micrometre") == 0) {
        *unit = GB_MICROMETRE;
    } else if (strcmp(text, "nm") == 0) {
        *unit = GB_NANOMETRE;
    } else if (strcmp(text, "m") == 0) {
        *unit = GB_METRE;
    } else {
        return GB_ERR_INVALID_ARGUMENT;
    }
    return GB_OK;
}

const char *gb_wavelength_unit_symbol(gb_wavelength_unit unit)
{
    switch (unit) {
    case GB_NANOMETRE: return "nm";
    case GB_METRE: return "m";
    case GB_MICROMETRE: break;
    }
    return "um";
}

double gb_wavelength_unit_per_micrometre(gb_wavelength_unit unit)
{
    switch (unit) {
    case GB_NANOMETRE: return 1e3;
    case GB_METRE: return 1e-6;
    case GB_MICROMETRE: break;
    }
    return 1.0;
}

gb_status gb_temperature_to_kelvin(double value, gb_temperature_unit unit, double *kelvin)
{
    double result;
    if (kelvin == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    switch (unit) {
    case GB_KELVIN: result = value; break;
    case GB_CELSIUS: result = value + CELSIUS_OFFSET; break;
    case GB_FAHRENHEIT:
        result = (value - FAHRENHEIT_ZERO_IN_CELSIUS_SCALE) / FAHRENHEIT_PER_KELVIN + CELSIUS_OFFSET;
        break;
    default: return GB_ERR_INVALID_ARGUMENT;
    }
    if (!(result > 0.0) || result > GB_TEMPERATURE_MAX) {
        return GB_ERR_TEMPERATURE_DOMAIN;
    }
    *kelvin = result;
    return GB_OK;
}

gb_status gb_temperature_from_kelvin(double kelvin, gb_temperature_unit unit, double *value)
{
    if (value == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(kelvin)) {
        return GB_ERR_NOT_FINITE;
    }
    switch (unit) {
    case GB_KELVIN: *value = kelvin; break;
    case GB_CELSIUS: *value = kelvin - CELSIUS_OFFSET; break;
    case GB_FAHRENHEIT:
        *value = (kelvin - CELSIUS_OFFSET) * FAHRENHEIT_PER_KELVIN + FAHRENHEIT_ZERO_IN_CELSIUS_SCALE;
        break;
    default: return GB_ERR_INVALID_ARGUMENT;
    }
    return GB_OK;
}

static double difference_scale(gb_temperature_unit unit)
{
    return unit == GB_FAHRENHEIT ? FAHRENHEIT_PER_KELVIN : 1.0;
}

gb_status gb_temperature_difference_to_kelvin(double value, gb_temperature_unit unit,
                                              double *kelvin)
{
    if (kelvin == NULL || (unsigned)unit > GB_FAHRENHEIT) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    *kelvin = value / difference_scale(unit);
    return GB_OK;
}

gb_status gb_temperature_difference_from_kelvin(double kelvin, gb_temperature_unit unit,
                                                double *value)
{
    if (value == NULL || (unsigned)unit > GB_FAHRENHEIT) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(kelvin)) {
        return GB_ERR_NOT_FINITE;
    }
    *value = kelvin * difference_scale(unit);
    return GB_OK;
}

/* Shared guard for every spectral conversion: finite, positive, finite result. */
static gb_status spectral_reciprocal(double value, double numerator, double *out)
{
    double result;
    if (out == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(value > 0.0)) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    result = numerator / value;
    if (!isfinite(result)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *out = result;
    return GB_OK;
}

gb_status gb_wavelength_to_micrometres(double value, gb_wavelength_unit unit, double *micrometres)
{
    double result;
    if (micrometres == NULL || (unsigned)unit > GB_METRE) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(value > 0.0)) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    result = value / gb_wavelength_unit_per_micrometre(unit);
    if (!isfinite(result)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    if (!(result > 0.0)) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    *micrometres = result;
    return GB_OK;
}

#define MICROMETRES_PER_CENTIMETRE 1e4
#define MICROMETRES_PER_METRE 1e6

gb_status gb_wavenumber_to_wavelength(double wavenumber_cm, double *wavelength_um)
{
    return spectral_reciprocal(wavenumber_cm, MICROMETRES_PER_CENTIMETRE, wavelength_um);
}

gb_status gb_wavelength_to_wavenumber(double wavelength_um, double *wavenumber_cm)
{
    return spectral_reciprocal(wavelength_um, MICROMETRES_PER_CENTIMETRE, wavenumber_cm);
}

gb_status gb_frequency_to_wavelength(double frequency_hz, double *wavelength_um)
{
    return spectral_reciprocal(frequency_hz, GB_SPEED_OF_LIGHT * MICROMETRES_PER_METRE,
                               wavelength_um);
}

gb_status gb_wavelength_to_frequency(double wavelength_um, double *frequency_hz)
{
    return spectral_reciprocal(wavelength_um, GB_SPEED_OF_LIGHT * MICROMETRES_PER_METRE,
                               frequency_hz);
}
