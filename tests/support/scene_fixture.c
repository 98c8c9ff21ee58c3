#include "scene_fixture.h"

#include <setjmp.h>
#include <stdarg.h>
#include <string.h>

#include <cmocka.h>

#include "status_expect.h"

static gb_term term_from_row(const vector_table *table, size_t row, const char *kind_column,
                             const char *value_column)
{
    const char *kind = vector_table_text(table, row, kind_column);
    gb_term term;
    if (strcmp(kind, "temperature") == 0) {
        term.kind = GB_TERM_TEMPERATURE;
    } else if (strcmp(kind, "radiance") == 0) {
        term.kind = GB_TERM_RADIANCE;
    } else {
        fail_msg("%s row %zu: unknown term kind '%s'", vector_table_file(table), row, kind);
    }
    term.value = vector_table_number(table, row, value_column);
    return term;
}

gb_scene scene_fixture_from_row(const vector_table *table, size_t row)
{
    gb_scene scene;
    scene.signal = term_from_row(table, row, "signal_kind", "signal");
    scene.emissivity = vector_table_number(table, row, "emissivity");
    scene.reflected = term_from_row(table, row, "reflected_kind", "reflected");
    scene.transmittance = vector_table_number(table, row, "transmittance");
    scene.atmosphere = term_from_row(table, row, "atmosphere_kind", "atmosphere");
    return scene;
}

gb_scene scene_fixture_temperatures(double apparent, double emissivity, double reflected,
                                    double transmittance, double atmosphere)
{
    gb_scene scene;
    scene.signal.kind = GB_TERM_TEMPERATURE;
    scene.signal.value = apparent;
    scene.emissivity = emissivity;
    scene.reflected.kind = GB_TERM_TEMPERATURE;
    scene.reflected.value = reflected;
    scene.transmittance = transmittance;
    scene.atmosphere.kind = GB_TERM_TEMPERATURE;
    scene.atmosphere.value = atmosphere;
    return scene;
}

void measure_case_from_row(measure_case *measure, const vector_table *table, size_t row)
{
    measure->name = vector_table_text(table, row, "case");
    measure->scene = scene_fixture_from_row(table, row);
    band_fixture_from_row(&measure->band, table, row);
    measure->expected = status_from_identifier(vector_table_text(table, row, "status"));
}
