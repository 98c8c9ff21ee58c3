/*
 * fraction.h — the blackbody fraction: the share of a blackbody's total
 * exitance (or photon exitance) emitted below wavelength lambda, as a function
 * of x = c2 / (lambda T) alone.
 *
 *   F(x)   = (15/pi^4) int_x^inf t^3 / (e^t - 1) dt      (energy)
 *   F_q(x) = (1/(2 zeta(3))) int_x^inf t^2 / (e^t - 1) dt (photons)
 *
 * Method: for x >= 3 the exponential series of Widger & Woodall, Bull. Amer.
 * Meteor. Soc. 57(10), 1217-1219 (1976), ceil(36/x)+1 terms; for x < 3 the
 * Bernoulli-number power series of the complement, 23 terms by Horner in x^2
 * (converges for x < 2 pi).  Both F and its complement Q = 1 - F are
 * returned, each computed where it is accurate, so that a band can take the
 * difference with the least cancellation.
 *
 * Domain: x > 0 (x = +inf gives F = 0, Q = 1).  Accuracy: F and Q each within
 * 1e-15 relative of a 30-digit mpmath quadrature for x in [1e-4, 700]
 * (tests/unit/test_fraction.c); F underflows to 0 gracefully beyond x ~ 740.
 */
#ifndef GREYBODY_FRACTION_H
#define GREYBODY_FRACTION_H

#include "status.h"

typedef struct gb_fraction {
    double below; /* F: share emitted at wavelengths below lambda (x above) */
    double above; /* Q = 1 - F */
} gb_fraction;

gb_status gb_blackbody_fraction(double x, gb_fraction *fraction);
gb_status gb_blackbody_photon_fraction(double x, gb_fraction *fraction);

/*
 * The same for a wavelength-temperature product lambda T in um K (> 0):
 * x = c2 / (lambda T).
 */
gb_status gb_blackbody_fraction_at(double wavelength_temperature_um_k, gb_fraction *fraction);

#endif
