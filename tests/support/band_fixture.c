#include "band_fixture.h"

#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

static void clear(band_fixture *fixture, gb_band_kind kind)
{
    memset(fixture, 0, sizeof *fixture);
    fixture->band.kind = kind;
}

void band_fixture_flat(band_fixture *fixture, gb_band_kind kind, double lower, double upper)
{
    clear(fixture, kind);
    fixture->band.lower = lower;
    fixture->band.upper = upper;
    snprintf(fixture->description, sizeof fixture->description, "%s %.17g..%.17g",
             kind == GB_BAND_WAVENUMBER ? "wavenumber" : "wavelength", lower, upper);
}

void band_fixture_total(band_fixture *fixture)
{
    clear(fixture, GB_BAND_TOTAL);
    snprintf(fixture->description, sizeof fixture->description, "total");
}

void band_fixture_response(band_fixture *fixture, const char *name)
{
    char file_name[96];
    vector_table *table;
    size_t count;
    clear(fixture, GB_BAND_RESPONSE);
    snprintf(file_name, sizeof file_name, "response_%s.tsv", name);
    table = vector_table_load(file_name);
    count = vector_table_rows(table);
    assert_true(count <= BAND_FIXTURE_MAX_POINTS);
    for (size_t i = 0; i < count; ++i) {
        fixture->wavelength_um[i] = vector_table_number(table, i, "wavelength_um");
        fixture->value[i] = vector_table_number(table, i, "response");
    }
    vector_table_free(table);
    fixture->band.response_wavelength_um = fixture->wavelength_um;
    fixture->band.response_value = fixture->value;
    fixture->band.response_count = count;
    snprintf(fixture->description, sizeof fixture->description, "response %s", name);
}

void band_fixture_from_row(band_fixture *fixture, const vector_table *table, size_t row)
{
    const char *kind = vector_table_text(table, row, "band_kind");
    if (strcmp(kind, "response") == 0) {
        band_fixture_response(fixture, vector_table_text(table, row, "response"));
    } else if (strcmp(kind, "total") == 0) {
        band_fixture_total(fixture);
    } else if (strcmp(kind, "wavelength") == 0 || strcmp(kind, "wavenumber") == 0) {
        band_fixture_flat(fixture,
                          strcmp(kind, "wavelength") == 0 ? GB_BAND_WAVELENGTH : GB_BAND_WAVENUMBER,
                          vector_table_number(table, row, "band_lower"),
                          vector_table_number(table, row, "band_upper"));
    } else {
        fail_msg("%s row %zu: unknown band kind '%s'", vector_table_file(table), row, kind);
    }
}

double band_fixture_claim(const band_fixture *fixture)
{
    switch (fixture->band.kind) {
    case GB_BAND_TOTAL: return 4.0 * DBL_EPSILON;
    case GB_BAND_RESPONSE: return 1e-12;
    default: break;
    }
    return 1e-13;
}
