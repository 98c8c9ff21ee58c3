/*
 * band_fixture.h — gb_band values for the tests: flat bands, the whole
 * spectrum, and the synthetic response tables tests/reference/generate.py
 * writes as tests/reference/vectors/response_<name>.tsv.
 *
 * Ownership: a fixture holds its response points itself and its `band` points
 * into them, so a filled fixture must not be copied; declare it where it is
 * used.  Nothing is allocated.
 */
#ifndef GREYBODY_TEST_BAND_FIXTURE_H
#define GREYBODY_TEST_BAND_FIXTURE_H

#include <stddef.h>

#include "band.h"
#include "vector_table.h"

#define BAND_FIXTURE_MAX_POINTS 64

typedef struct band_fixture {
    gb_band band;
    double wavelength_um[BAND_FIXTURE_MAX_POINTS];
    double value[BAND_FIXTURE_MAX_POINTS];
    char description[96]; /* "wavelength 8..14", "response synthetic_lwir", for messages */
} band_fixture;

void band_fixture_flat(band_fixture *fixture, gb_band_kind kind, double lower, double upper);
void band_fixture_total(band_fixture *fixture);
/* Loads response_<name>.tsv. */
void band_fixture_response(band_fixture *fixture, const char *name);
/*
 * From a vector row: band_kind ("wavelength", "wavenumber", "total" or
 * "response"), band_lower, band_upper, and for "response" the column response.
 */
void band_fixture_from_row(band_fixture *fixture, const vector_table *table, size_t row);

/*
 * The relative accuracy band.h claims for the fixture's band radiance: 1e-13
 * for flat bands, 1e-12 for response bands; the whole spectrum is sigma T^4 / pi,
 * good to a few roundings (planck.h: <= 2 ulp for sigma T^4).
 */
double band_fixture_claim(const band_fixture *fixture);

#endif
