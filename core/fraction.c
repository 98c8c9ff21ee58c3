#include "fraction.h"

#include <math.h>
#include <stddef.h>

#include "constants.h"

/* Below this x the power series of the complement is used; above it the exponential series. */
#define SERIES_SWITCH_X 3.0
/* Terms of the exponential series: ceil(EXPONENTIAL_TERMS_SCALE / x) + 1 reach e^-36 ~ 2e-16. */
#define EXPONENTIAL_TERMS_SCALE 36.0
#define POWER_SERIES_TERMS 23

/*
 * a_k = B_2k / ((2k)! (2k + 3)), energy series (k = 1..23), and
 * q_k = B_2k / ((2k)! (2k + 2)), photon series; computed with mpmath at 30
 * digits (B_2k the Bernoulli numbers) and checked by tests/reference/generate.py.
 */
static const double energy_power_coefficients[POWER_SERIES_TERMS] = {
    1.666666666666666666667e-2,    -1.984126984126984126984e-4,  3.674309229864785420341e-6,
    -7.515632515632515632516e-8,   1.605904383682161459939e-9,   -3.522793425791662123232e-11,
    7.872080312167458136957e-13,   -1.784042261222412035174e-14, 4.088600979179925982922e-16,
    -9.455950863295921187137e-18,  2.203601131344091806081e-19,  -5.168320254004638274336e-21,
    1.218864496423954300584e-22,   -2.888231428076628016259e-24, 6.87258318890206987973e-26,
    -1.641368762534914984361e-27,  3.932898582742878113152e-29,  -9.451269078629000456876e-31,
    2.277252257828059676106e-32,   -5.500052129536348685022e-34, 1.331260391662696512147e-35,
    -3.228627413762319705768e-37,  7.844404337661608637203e-39,
};

static const double photon_power_coefficients[POWER_SERIES_TERMS] = {
    2.083333333333333333333e-2,    -2.314814814814814814815e-4,  4.133597883597883597884e-6,
    -8.267195767195767195767e-8,   1.739729748989008248268e-9,   -3.774421527633923703463e-11,
    8.364085331677924270517e-13,   -1.883155720179212703795e-14, 4.293031028138922282068e-16,
    -9.885766811627553968371e-18,  2.295417845150095631334e-19,  -5.367101802235585900272e-21,
    1.262395371296238382748e-22,   -2.984505809012515616801e-24, 7.087351413555259563472e-26,
    -1.689644314374177189783e-27,  4.042145765596846949629e-29,  -9.699986685961342574163e-31,
    2.334183564273761168008e-32,   -5.631005751668166510856e-34, 1.361516309655030523786e-35,
    -3.298814966235413612415e-37,  8.007829428029558817145e-39,
};

/* sum_k c_k y^(k-1), y = x^2, by Horner from the smallest term. */
static double horner_in_square(const double *coefficients, double x)
{
    double square = x * x;
    double sum = 0.0;
    for (size_t k = POWER_SERIES_TERMS; k-- > 0;) {
        sum = sum * square + coefficients[k];
    }
    return sum;
}

static size_t exponential_term_count(double x)
{
    return (size_t)ceil(EXPONENTIAL_TERMS_SCALE / x) + 1;
}

/* Above this x, e^-x is near the subnormal range: the common factor is applied in logarithms. */
#define SUBNORMAL_SAFE_EXPONENT 700.0
#define NEGLIGIBLE_BEYOND_X 800.0

/* sum_n e^(-n x) p(x, n) / n as e^-x times a sum that starts at p(x, 1). */
static double exponential_series(double x, double (*term)(double x, double inverse_n))
{
    double decay = exp(-x);
    double power = 1.0;
    double scaled = 0.0;
    size_t terms = exponential_term_count(x);
    if (!(x < NEGLIGIBLE_BEYOND_X)) {
        return 0.0; /* x^3 e^-x is below the smallest double (and x^3 alone may overflow) */
    }
    for (size_t n = 1; n <= terms && power > 0.0; ++n) {
        double inverse_n = 1.0 / (double)n;
        scaled += power * inverse_n * term(x, inverse_n);
        power *= decay;
    }
    if (x <= SUBNORMAL_SAFE_EXPONENT) {
        return decay * scaled;
    }
    return exp(log(scaled) - x);
}

/* x^3 + 3x^2/n + 6x/n^2 + 6/n^3: int_x^inf t^3/(e^t-1) dt = sum_n e^(-nx)/n (this). */
static double energy_term(double x, double inverse_n)
{
    return x * x * x + inverse_n * (3.0 * x * x + inverse_n * (6.0 * x + 6.0 * inverse_n));
}

/* x^2 + 2x/n + 2/n^2: int_x^inf t^2/(e^t-1) dt = sum_n e^(-nx)/n (this). */
static double photon_term(double x, double inverse_n)
{
    return x * x + inverse_n * (2.0 * x + 2.0 * inverse_n);
}

static gb_status check_exponent(double x, gb_fraction *fraction)
{
    if (fraction == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (isnan(x)) {
        return GB_ERR_NOT_FINITE;
    }
    return x > 0.0 ? GB_OK : GB_ERR_SPECTRAL_DOMAIN;
}

/*
 * The two fractions differ only in the power p of t^p / (e^t - 1) (3 for
 * energy, 2 for photons), their normalisation, exponential-series term and
 * Bernoulli coefficients.  Small-x head: int_0^x t^p/(e^t-1) dt =
 * x^p (1/p - x/(2(p+1))) + x^(p+2) sum_k c_k x^(2k-2).
 */
struct fraction_kind {
    int power;
    double normalisation;
    double (*term)(double x, double inverse_n);
    const double *coefficients;
};

static const struct fraction_kind energy_fraction = {3, GB_FIFTEEN_OVER_PI4, energy_term,
                                                     energy_power_coefficients};
static const struct fraction_kind photon_fraction = {2, GB_HALF_INVERSE_ZETA3, photon_term,
                                                     photon_power_coefficients};

static gb_status fraction_of(const struct fraction_kind *kind, double x, gb_fraction *fraction)
{
    gb_status status = check_exponent(x, fraction);
    if (status != GB_OK) {
        return status;
    }
    if (x >= SERIES_SWITCH_X) {
        fraction->below = kind->normalisation * exponential_series(x, kind->term);
        fraction->above = 1.0 - fraction->below;
    } else {
        double p = (double)kind->power;
        double x_to_p = kind->power == 3 ? x * x * x : x * x;
        double head = x_to_p * (1.0 / p - x / (2.0 * (p + 1.0)));
        double power_sum = x_to_p * x * x * horner_in_square(kind->coefficients, x);
        fraction->above = kind->normalisation * (head + power_sum);
        fraction->below = 1.0 - fraction->above;
    }
    return GB_OK;
}

gb_status gb_blackbody_fraction(double x, gb_fraction *fraction)
{
    return fraction_of(&energy_fraction, x, fraction);
}

gb_status gb_blackbody_photon_fraction(double x, gb_fraction *fraction)
{
    return fraction_of(&photon_fraction, x, fraction);
}

gb_status gb_blackbody_fraction_at(double wavelength_temperature_um_k, gb_fraction *fraction)
{
    if (fraction == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(wavelength_temperature_um_k)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(wavelength_temperature_um_k > 0.0)) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    return gb_blackbody_fraction(GB_C2_UM / wavelength_temperature_um_k, fraction);
}
