/*
 * quadrature.h (internal) — Planck's law integrated over a wavelength
 * interval with a linear weight, by Gauss-Legendre quadrature.
 *
 * The interval [lower, upper] um carries a weight that varies linearly from
 * weight_lower to weight_upper (1, 1 for a flat band; the response values for
 * one piece of a response table).  It is split into pieces of equal
 * wavelength ratio, each spanning a ratio <= 1.5 and an exponent range
 * x = c2/(lambda T) <= 6, and each piece takes 20-point Gauss-Legendre
 * (nodes and weights from mpmath at 21 digits).  Where x > 745 the integrand
 * is below the smallest double and that part is skipped.  Relative error
 * < 1e-14 for the integrands here (the polynomial degree 39 rule on a piece
 * this small leaves an error far below rounding; measured in
 * tests/unit/test_band.c against mpmath).
 */
#ifndef GREYBODY_QUADRATURE_H
#define GREYBODY_QUADRATURE_H

typedef struct gb_planck_integrals {
    double radiance;        /* int w B dlambda, W m^-2 sr^-1 */
    double derivative;      /* int w dB/dT dlambda, W m^-2 sr^-1 K^-1 */
    double photon_radiance; /* int w B lambda / (h c) dlambda, photons s^-1 m^-2 sr^-1 */
} gb_planck_integrals;

/* Adds the integrals over one linearly weighted interval to *sums. T > 0, 0 < lower < upper. */
void gb_integrate_planck_interval(double lower_um, double upper_um, double weight_lower,
                                  double weight_upper, double temperature_k,
                                  gb_planck_integrals *sums);

#endif
