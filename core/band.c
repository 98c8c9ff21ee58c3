#include "band.h"

#include <math.h>

#include "constants.h"
#include "fraction.h"
#include "planck.h"
#include "quadrature.h"
#include "solver.h"

/*
 * A difference of fractions that loses more than 2 bits to cancellation goes
 * to quadrature: both carry the exponent's rounding (x + 1) eps, so beyond
 * that the quadrature is the more accurate.
 */
#define CANCELLATION_LIMIT 4.0
#define MICROMETRES_PER_CENTIMETRE 1e4
#define EXPONENT_UNDERFLOW 745.0
#define SUBNORMAL_SAFE_EXPONENT 700.0

static gb_status check_positive_limit(double value)
{
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    return value > 0.0 ? GB_OK : GB_ERR_BAND_LIMITS;
}

static gb_status validate_response(const gb_band *band)
{
    int any_positive = 0;
    if (band->response_wavelength_um == NULL || band->response_value == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (band->response_count < 2) {
        return GB_ERR_RESPONSE_TOO_SHORT;
    }
    for (size_t i = 0; i < band->response_count; ++i) {
        double wavelength = band->response_wavelength_um[i];
        double value = band->response_value[i];
        gb_status status = check_positive_limit(wavelength);
        if (status != GB_OK) {
            return status;
        }
        if (!isfinite(value)) {
            return GB_ERR_NOT_FINITE;
        }
        if (i > 0 && !(wavelength > band->response_wavelength_um[i - 1])) {
            return GB_ERR_RESPONSE_UNSORTED;
        }
        if (value < 0.0) {
            return GB_ERR_RESPONSE_NEGATIVE;
        }
        any_positive |= value > 0.0;
    }
    return any_positive ? GB_OK : GB_ERR_RESPONSE_ALL_ZERO;
}

gb_status gb_band_validate(const gb_band *band)
{
    gb_status status;
    if (band == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    switch (band->kind) {
    case GB_BAND_TOTAL: return GB_OK;
    case GB_BAND_WAVELENGTH:
    case GB_BAND_WAVENUMBER:
        status = check_positive_limit(band->lower);
        if (status == GB_OK) {
            status = check_positive_limit(band->upper);
        }
        if (status != GB_OK) {
            return status;
        }
        return band->lower < band->upper ? GB_OK : GB_ERR_BAND_REVERSED;
    case GB_BAND_RESPONSE: return validate_response(band);
    }
    return GB_ERR_INVALID_ARGUMENT;
}

/* Everything a band yields for a blackbody at one temperature. */
struct band_values {
    double radiance;
    double derivative;
    double photon_exitance;
};

/* Flat band limits in micrometres, whichever coordinate the band was given in. */
static void flat_limits_um(const gb_band *band, double *lower_um, double *upper_um)
{
    if (band->kind == GB_BAND_WAVENUMBER) {
        *lower_um = MICROMETRES_PER_CENTIMETRE / band->upper;
        *upper_um = MICROMETRES_PER_CENTIMETRE / band->lower;
    } else {
        *lower_um = band->lower;
        *upper_um = band->upper;
    }
}

/*
 * F(x_long) - F(x_short) with the least cancellation: from the "below" shares
 * when they are the smaller numbers, else from the complements.  Returns 0
 * through *well_conditioned when the difference is too cancelled to trust.
 */
static double fraction_difference(const gb_fraction *short_end, const gb_fraction *long_end,
                                  int *well_conditioned)
{
    double difference, scale;
    if (long_end->below <= short_end->above) {
        difference = long_end->below - short_end->below;
        scale = long_end->below;
    } else {
        difference = short_end->above - long_end->above;
        scale = short_end->above;
    }
    *well_conditioned = !(difference * CANCELLATION_LIMIT < scale);
    return difference;
}

/* x^4 / (e^x - 1), the derivative of the energy fraction up to 15/(pi^4 T). */
static double fraction_slope_term(double x)
{
    if (x > EXPONENT_UNDERFLOW) {
        return 0.0;
    }
    if (x > SUBNORMAL_SAFE_EXPONENT) {
        return exp(4.0 * log(x) - x - log(-expm1(-x)));
    }
    return x * x * x * x / expm1(x);
}

static void flat_band_by_quadrature(double lower_um, double upper_um, double temperature_k,
                                    struct band_values *values)
{
    gb_planck_integrals sums = {0.0, 0.0, 0.0};
    gb_integrate_planck_interval(lower_um, upper_um, 1.0, 1.0, temperature_k, &sums);
    values->radiance = sums.radiance;
    values->derivative = sums.derivative;
    values->photon_exitance = GB_PI * sums.photon_radiance;
}

static void flat_band_values(const gb_band *band, double temperature_k, struct band_values *values)
{
    double lower_um, upper_um, x_short, x_long, energy, photons, t_cubed;
    gb_fraction energy_short, energy_long, photon_short, photon_long;
    int energy_ok, photon_ok;

    flat_limits_um(band, &lower_um, &upper_um);
    x_short = GB_C2_UM / (lower_um * temperature_k);
    x_long = GB_C2_UM / (upper_um * temperature_k);
    /* x > 0 and not NaN here, so these cannot fail. */
    (void)gb_blackbody_fraction(x_short, &energy_short);
    (void)gb_blackbody_fraction(x_long, &energy_long);
    (void)gb_blackbody_photon_fraction(x_short, &photon_short);
    (void)gb_blackbody_photon_fraction(x_long, &photon_long);
    energy = fraction_difference(&energy_short, &energy_long, &energy_ok);
    photons = fraction_difference(&photon_short, &photon_long, &photon_ok);
    if (!energy_ok || !photon_ok) {
        flat_band_by_quadrature(lower_um, upper_um, temperature_k, values);
        return;
    }
    t_cubed = temperature_k * temperature_k * temperature_k;
    values->radiance = GB_SIGMA / GB_PI * t_cubed * temperature_k * energy;
    values->derivative =
        GB_SIGMA / GB_PI * t_cubed *
        (4.0 * energy + GB_FIFTEEN_OVER_PI4 * (fraction_slope_term(x_long) -
                                               fraction_slope_term(x_short)));
    values->photon_exitance = GB_SIGMA_PHOTON * t_cubed * photons;
}

static void response_band_values(const gb_band *band, double temperature_k,
                                 struct band_values *values)
{
    gb_planck_integrals sums = {0.0, 0.0, 0.0};
    for (size_t i = 0; i + 1 < band->response_count; ++i) {
        double weight_lower = band->response_value[i];
        double weight_upper = band->response_value[i + 1];
        if (weight_lower == 0.0 && weight_upper == 0.0) {
            continue;
        }
        gb_integrate_planck_interval(band->response_wavelength_um[i],
                                     band->response_wavelength_um[i + 1], weight_lower,
                                     weight_upper, temperature_k, &sums);
    }
    values->radiance = sums.radiance;
    values->derivative = sums.derivative;
    values->photon_exitance = GB_PI * sums.photon_radiance;
}

static void total_band_values(double temperature_k, struct band_values *values)
{
    double t_cubed = temperature_k * temperature_k * temperature_k;
    values->radiance = GB_SIGMA / GB_PI * t_cubed * temperature_k;
    values->derivative = 4.0 * GB_SIGMA / GB_PI * t_cubed;
    values->photon_exitance = GB_SIGMA_PHOTON * t_cubed;
}

/* The band and temperature are valid here. */
static void band_values_at(const gb_band *band, double temperature_k, struct band_values *values)
{
    switch (band->kind) {
    case GB_BAND_TOTAL: total_band_values(temperature_k, values); break;
    case GB_BAND_RESPONSE: response_band_values(band, temperature_k, values); break;
    case GB_BAND_WAVELENGTH:
    case GB_BAND_WAVENUMBER: flat_band_values(band, temperature_k, values); break;
    }
}

static gb_status checked_values(const gb_band *band, double temperature_k,
                                struct band_values *values)
{
    gb_status status = gb_band_validate(band);
    if (status == GB_OK) {
        status = gb_check_temperature(temperature_k);
    }
    if (status != GB_OK) {
        return status;
    }
    band_values_at(band, temperature_k, values);
    if (!isfinite(values->radiance) || !isfinite(values->derivative) ||
        !isfinite(values->photon_exitance)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    return GB_OK;
}

gb_status gb_band_radiance(const gb_band *band, double temperature_k, double *radiance,
                           double *derivative)
{
    struct band_values values;
    gb_status status;
    if (radiance == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = checked_values(band, temperature_k, &values);
    if (status != GB_OK) {
        return status;
    }
    *radiance = values.radiance;
    if (derivative != NULL) {
        *derivative = values.derivative;
    }
    return GB_OK;
}

gb_status gb_band_evaluate(const gb_band *band, double temperature_k, double emissivity,
                           gb_band_quantities *quantities)
{
    struct band_values values;
    gb_band_quantities result;
    double total_exitance;
    gb_status status;
    if (quantities == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_emissivity(emissivity);
    if (status == GB_OK) {
        status = checked_values(band, temperature_k, &values);
    }
    if (status == GB_OK) {
        status = gb_total_exitance(temperature_k, 1.0, &total_exitance);
    }
    if (status != GB_OK) {
        return status;
    }
    result.radiance = emissivity * values.radiance;
    result.exitance = GB_PI * result.radiance;
    result.photon_exitance = emissivity * values.photon_exitance;
    /* A body so cold that sigma T^4 underflows emits nothing anywhere: share 0. */
    result.fraction = total_exitance > 0.0 ? GB_PI * values.radiance / total_exitance : 0.0;
    result.total_exitance = emissivity * total_exitance;
    result.radiance_derivative = emissivity * values.derivative;
    if (!isfinite(result.exitance) || !isfinite(result.fraction)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *quantities = result;
    return GB_OK;
}

/* Where the band sits and how wide it is, for the solver's first guess. */
static void effective_wavelength(const gb_band *band, double *centre_um, double *width_um)
{
    if (band->kind == GB_BAND_RESPONSE) {
        double area = 0.0, moment = 0.0;
        for (size_t i = 0; i + 1 < band->response_count; ++i) {
            double a = band->response_wavelength_um[i], b = band->response_wavelength_um[i + 1];
            double ra = band->response_value[i], rb = band->response_value[i + 1];
            area += 0.5 * (ra + rb) * (b - a);
            moment += (b - a) * (ra * (2.0 * a + b) + rb * (a + 2.0 * b)) / 6.0;
        }
        *centre_um = moment / area;
        *width_um = area;
        return;
    }
    {
        double lower_um, upper_um;
        flat_limits_um(band, &lower_um, &upper_um);
        *centre_um = sqrt(lower_um) * sqrt(upper_um);
        *width_um = upper_um - lower_um;
    }
}

static double first_guess(const gb_band *band, double radiance)
{
    double centre_um, width_um, guess;
    effective_wavelength(band, &centre_um, &width_um);
    if (gb_brightness_temperature(GB_WAVELENGTH, centre_um, radiance / width_um, 1.0, &guess) !=
            GB_OK ||
        !(guess > GB_BAND_TEMPERATURE_MIN && guess < GB_BAND_TEMPERATURE_MAX)) {
        guess = 300.0;
    }
    return guess;
}

/* ln L_band(T) and its slope, for the shared solver; an underflowed radiance cannot be used. */
static gb_status log_band_radiance(const void *context, double temperature_k, double *value,
                                   double *slope)
{
    struct band_values values;
    band_values_at(context, temperature_k, &values);
    if (!(values.radiance > 0.0)) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    *value = log(values.radiance);
    *slope = values.derivative / values.radiance;
    return GB_OK;
}

gb_status gb_band_temperature(const gb_band *band, double radiance, double emissivity,
                              double *temperature_k)
{
    double target, temperature;
    gb_status status;
    if (temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(radiance)) {
        return GB_ERR_NOT_FINITE;
    }
    status = gb_check_emissivity(emissivity);
    if (status == GB_OK) {
        status = gb_band_validate(band);
    }
    if (status != GB_OK) {
        return status;
    }
    if (!(radiance > 0.0)) {
        return GB_ERR_RADIANCE_DOMAIN;
    }
    target = radiance / emissivity;
    if (!isfinite(target)) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    if (band->kind == GB_BAND_TOTAL) {
        temperature = sqrt(sqrt(target * GB_PI / GB_SIGMA));
        if (!(temperature >= GB_BAND_TEMPERATURE_MIN && temperature <= GB_BAND_TEMPERATURE_MAX)) {
            return GB_ERR_RADIANCE_OUT_OF_RANGE;
        }
        *temperature_k = temperature;
        return GB_OK;
    }
    return gb_solve_rising(log_band_radiance, band, log(target), first_guess(band, target),
                           temperature_k, NULL);
}
