/*
 * scene_fixture.h — a gb_scene from a row of tests/reference/vectors/measure.tsv:
 * columns signal_kind, signal, emissivity, reflected_kind, reflected,
 * transmittance, atmosphere_kind, atmosphere, each kind "temperature" or
 * "radiance".
 */
#ifndef GREYBODY_TEST_SCENE_FIXTURE_H
#define GREYBODY_TEST_SCENE_FIXTURE_H

#include <stddef.h>

#include "band_fixture.h"
#include "measure.h"
#include "vector_table.h"

gb_scene scene_fixture_from_row(const vector_table *table, size_t row);

/* A scene whose three terms are temperatures in K. */
gb_scene scene_fixture_temperatures(double apparent, double emissivity, double reflected,
                                    double transmittance, double atmosphere);

/*
 * One whole row of measure.tsv: the case name, its scene, its band and the
 * status expected.  `band.band` points into the case: do not copy a filled one.
 */
typedef struct measure_case {
    const char *name; /* points into the table */
    gb_scene scene;
    band_fixture band;
    gb_status expected;
} measure_case;

void measure_case_from_row(measure_case *measure, const vector_table *table, size_t row);

#endif
