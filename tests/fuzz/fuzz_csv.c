/*
 * fuzz_csv.c — the RFC 4180 reader of server/csv.h on any bytes.
 *
 * Beyond "no crash, no leak, no hang" (the sanitizers and libFuzzer), two
 * properties must hold for every input: each field lies inside the reader's
 * text buffer and is NUL-terminated there; and every well-formed record,
 * written back with gb_csv_write_field, reads back to the same fields (a
 * lone empty field excepted: written back it is an empty line, which the
 * reader skips by design).  A violation aborts, and libFuzzer keeps the input.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "csv.h"

#define MAX_RECORDS 64

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static void check(int condition, const char *what)
{
    if (!condition) {
        fprintf(stderr, "fuzz_csv: %s\n", what);
        abort();
    }
}

static void round_trip(const gb_csv *csv, size_t r)
{
    const gb_csv_record *record = &csv->records[r];
    gb_jw w;
    gb_csv again;
    size_t length = 0;
    char *text;
    if (record->malformed || (record->field_count == 1 && gb_csv_field(csv, r, 0)[0] == '\0')) {
        return;
    }
    gb_jw_init(&w, 64);
    for (size_t f = 0; f < record->field_count; f++) {
        gb_csv_write_field(&w, gb_csv_field(csv, r, f), f == 0);
    }
    gb_csv_end_record(&w);
    text = gb_jw_take(&w, &length);
    check(text != NULL, "writer failed");
    check(gb_csv_parse(text, length, 2, &again) == GB_CSV_OK, "written record does not read");
    check(again.record_count == 1, "written record reads as another count of records");
    check(again.records[0].field_count == record->field_count, "field count changed");
    for (size_t f = 0; f < record->field_count; f++) {
        check(strcmp(gb_csv_field(&again, 0, f), gb_csv_field(csv, r, f)) == 0,
              "field changed in the round trip");
    }
    gb_csv_free(&again);
    free(text);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    gb_csv csv;
    gb_csv_status status = gb_csv_parse((const char *)data, size, MAX_RECORDS, &csv);
    if (status == GB_CSV_OK) {
        size_t limit = 2 * size + 2;
        check(csv.record_count <= MAX_RECORDS, "more records than allowed");
        for (size_t r = 0; r < csv.record_count; r++) {
            for (size_t f = 0; f < csv.records[r].field_count; f++) {
                size_t offset = csv.field_offset[csv.records[r].first_field + f];
                check(offset < limit, "field outside the text buffer");
                check(memchr(csv.text + offset, '\0', limit - offset) != NULL,
                      "field not NUL-terminated");
            }
            round_trip(&csv, r);
        }
    }
    gb_csv_free(&csv);
    return 0;
}
