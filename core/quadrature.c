#include "quadrature.h"

#include <math.h>
#include <stddef.h>

#include "constants.h"

#define GAUSS_HALF_POINTS 10
#define LARGEST_EXPONENT 745.0  /* e^-745 is below the smallest subnormal double */
#define SUBNORMAL_SAFE_EXPONENT 700.0
#define MAX_PIECE_RATIO 1.5
#define MAX_PIECE_EXPONENT_SPAN 6.0
#define MAX_PIECES 4096
#define HC_UM 1.9864458571489286e-19 /* h c in J um (CODATA 2018 exact) */

/* 20-point Gauss-Legendre on [-1, 1]: positive nodes and their weights (mpmath, 21 digits). */
static const double gauss_nodes[GAUSS_HALF_POINTS] = {
    0.993128599185094924786, 0.963971927277913791268, 0.912234428251325905868,
    0.839116971822218823395, 0.746331906460150792614, 0.636053680726515025453,
    0.510867001950827098004, 0.373706088715419560673, 0.22778585114164507808,
    0.0765265211334973337546,
};
static const double gauss_weights[GAUSS_HALF_POINTS] = {
    0.0176140071391521183119, 0.040601429800386941331, 0.0626720483341090635695,
    0.0832767415767047487248, 0.101930119817240435037, 0.118194531961518417312,
    0.131688638449176626898,  0.142096109318382051329, 0.149172986472603746788,
    0.152753387130725850698,
};

static void accumulate_node(double wavelength_um, double weight, double temperature_k,
                            gb_planck_integrals *sums)
{
    double exponent = GB_C2_UM / (wavelength_um * temperature_k);
    double decay = exp(-exponent);
    double one_minus_decay = -expm1(-exponent);
    double squared = wavelength_um * wavelength_um;
    double radiance =
        exponent <= SUBNORMAL_SAFE_EXPONENT
            ? GB_C1L_UM / (squared * squared * wavelength_um) * (decay / one_minus_decay)
            /* e^-x near the subnormal range: keep the digits by working in logarithms */
            : exp(log(GB_C1L_UM) - 5.0 * log(wavelength_um) - exponent - log(one_minus_decay));
    double weighted = weight * radiance;
    sums->radiance += weighted;
    sums->derivative += weighted * exponent / (temperature_k * one_minus_decay);
    sums->photon_radiance += weighted * wavelength_um / HC_UM;
}

static size_t piece_count(double lower_um, double upper_um, double temperature_k)
{
    double largest_exponent = GB_C2_UM / (lower_um * temperature_k);
    double ratio = MAX_PIECE_RATIO;
    double pieces;
    if (largest_exponent > MAX_PIECE_EXPONENT_SPAN * MAX_PIECE_RATIO / (MAX_PIECE_RATIO - 1.0)) {
        /* x (1 - 1/r) <= span keeps the exponent range of the steepest piece in bounds. */
        ratio = 1.0 / (1.0 - MAX_PIECE_EXPONENT_SPAN / largest_exponent);
    }
    pieces = ceil(log(upper_um / lower_um) / log(ratio));
    if (!(pieces >= 1.0)) {
        return 1;
    }
    return pieces > MAX_PIECES ? MAX_PIECES : (size_t)pieces;
}

void gb_integrate_planck_interval(double lower_um, double upper_um, double weight_lower,
                                  double weight_upper, double temperature_k,
                                  gb_planck_integrals *sums)
{
    double visible_lower = GB_C2_UM / (LARGEST_EXPONENT * temperature_k);
    double slope = (weight_upper - weight_lower) / (upper_um - lower_um);
    double start = lower_um;
    size_t pieces;
    double step_ratio;
    gb_planck_integrals piece_sums = {0.0, 0.0, 0.0};

    if (upper_um <= visible_lower) {
        return;
    }
    if (start < visible_lower) {
        start = visible_lower;
    }
    pieces = piece_count(start, upper_um, temperature_k);
    step_ratio = pow(upper_um / start, 1.0 / (double)pieces);
    for (size_t piece = 0; piece < pieces; ++piece) {
        double piece_lower = piece == 0 ? start : start * pow(step_ratio, (double)piece);
        double piece_upper = piece + 1 == pieces ? upper_um
                                                 : start * pow(step_ratio, (double)(piece + 1));
        double centre = 0.5 * (piece_lower + piece_upper);
        double half_width = 0.5 * (piece_upper - piece_lower);
        gb_planck_integrals node_sums = {0.0, 0.0, 0.0};
        for (size_t node = 0; node < GAUSS_HALF_POINTS; ++node) {
            double offset = half_width * gauss_nodes[node];
            double left = centre - offset;
            double right = centre + offset;
            gb_planck_integrals pair = {0.0, 0.0, 0.0};
            accumulate_node(left, weight_lower + slope * (left - lower_um), temperature_k, &pair);
            accumulate_node(right, weight_lower + slope * (right - lower_um), temperature_k, &pair);
            node_sums.radiance += gauss_weights[node] * pair.radiance;
            node_sums.derivative += gauss_weights[node] * pair.derivative;
            node_sums.photon_radiance += gauss_weights[node] * pair.photon_radiance;
        }
        piece_sums.radiance += half_width * node_sums.radiance;
        piece_sums.derivative += half_width * node_sums.derivative;
        piece_sums.photon_radiance += half_width * node_sums.photon_radiance;
    }
    sums->radiance += piece_sums.radiance;
    sums->derivative += piece_sums.derivative;
    sums->photon_radiance += piece_sums.photon_radiance;
}
