/*
 * test_csv.c — the RFC 4180 reader and writer of server/csv.h, without a
 * server (it sits with the integration tests because it links server
 * objects).
 *
 * Expected records follow the rules of RFC 4180 section 2 (fields separated
 * by commas, records by line breaks, double quotes around fields that hold
 * commas, quotes or line breaks, a quote inside doubled), its examples quoted
 * where a case says so, and the additions csv.h documents (byte-order mark,
 * LF and lone CR, empty lines, blanks around unquoted fields, malformed
 * records that do not spoil the others).
 */
#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <stdarg.h>
#include <cmocka.h>

#include "csv.h"

#define MAX_EXPECTED_RECORDS 4
#define MAX_EXPECTED_FIELDS 4

typedef struct parse_case {
    const char *name;
    const char *input;
    size_t length; /* 0: strlen(input) */
    size_t records;
    const char *fields[MAX_EXPECTED_RECORDS][MAX_EXPECTED_FIELDS + 1]; /* NULL-terminated rows */
    size_t lines[MAX_EXPECTED_RECORDS];
    bool malformed[MAX_EXPECTED_RECORDS];
    size_t columns[MAX_EXPECTED_RECORDS];
} parse_case;

static const parse_case parse_cases[] = {
    {"RFC 4180 2.1: CRLF line breaks", "aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n", 0, 2,
     {{"aaa", "bbb", "ccc", NULL}, {"zzz", "yyy", "xxx", NULL}}, {1, 2}, {0}, {0}},
    {"RFC 4180 2.2: the last record without a line break", "aaa,bbb,ccc\r\nzzz,yyy,xxx", 0, 2,
     {{"aaa", "bbb", "ccc", NULL}, {"zzz", "yyy", "xxx", NULL}}, {1, 2}, {0}, {0}},
    {"RFC 4180 2.5: quoted fields", "\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx", 0, 2,
     {{"aaa", "bbb", "ccc", NULL}, {"zzz", "yyy", "xxx", NULL}}, {1, 2}, {0}, {0}},
    {"RFC 4180 2.6: a line break and a comma inside quotes",
     "\"aaa\",\"b\r\nbb\",\"c,cc\"\r\nzzz,yyy,xxx", 0, 2,
     {{"aaa", "b\r\nbb", "c,cc", NULL}, {"zzz", "yyy", "xxx", NULL}}, {1, 3}, {0}, {0}},
    {"RFC 4180 2.7: a doubled quote stands for one", "\"aaa\",\"b\"\"bb\",\"ccc\"", 0, 1,
     {{"aaa", "b\"bb", "ccc", NULL}}, {1}, {0}, {0}},
    {"LF and a lone CR end records too", "a,b\nc,d\re,f", 0, 3,
     {{"a", "b", NULL}, {"c", "d", NULL}, {"e", "f", NULL}}, {1, 2, 3}, {0}, {0}},
    {"a byte-order mark is skipped", "\xEF\xBB\xBFtemperature,signal\r\n300,1\r\n", 0, 2,
     {{"temperature", "signal", NULL}, {"300", "1", NULL}}, {1, 2}, {0}, {0}},
    {"empty and blank lines are no records", "\r\na,b\r\n\r\n   \r\n\n1,2\r\n\r\n", 0, 2,
     {{"a", "b", NULL}, {"1", "2", NULL}}, {2, 6}, {0}, {0}},
    {"blanks around unquoted fields go, inside quotes they stay",
     " 300 ,\t0.95\t,\" x \"\r\n", 0, 1, {{"300", "0.95", " x ", NULL}}, {1}, {0}, {0}},
    {"empty fields, also the last", "a,,c,\r\n,,,\r\n", 0, 2,
     {{"a", "", "c", "", NULL}, {"", "", "", "", NULL}}, {1, 2}, {0}, {0}},
    {"a quote inside an unquoted field spoils that record only",
     "a,b\r\n1,2\"3\r\n4,5\r\n", 0, 3, {{"a", "b", NULL}, {"1", "2", NULL}, {"4", "5", NULL}},
     {1, 2, 3}, {false, true, false}, {0, 4, 0}},
    {"text after a closing quote spoils that record only", "\"a\"b,c\r\nd,e", 0, 2,
     {{"a", NULL}, {"d", "e", NULL}}, {1, 2}, {true, false}, {4, 0}},
    {"a NUL byte spoils its record", "a,b\r\nx\0y,z\r\n1,2", 15, 3,
     {{"a", "b", NULL}, {"x", NULL}, {"1", "2", NULL}}, {1, 2, 3}, {false, true, false},
     {0, 2, 0}},
    {"a quoted field's line breaks count for the next record's line", "\"a\nb\nc\",d\ne,f", 0,
     2, {{"a\nb\nc", "d", NULL}, {"e", "f", NULL}}, {1, 4}, {0}, {0}},
    {"blank before an opening quote", "x,  \"q,r\"\r\n", 0, 1, {{"x", "q,r", NULL}}, {1}, {0},
     {0}},
};

static void test_parse_cases(void **state)
{
    (void)state;
    for (size_t c = 0; c < sizeof parse_cases / sizeof parse_cases[0]; c++) {
        const parse_case *pc = &parse_cases[c];
        gb_csv csv;
        size_t length = pc->length ? pc->length : strlen(pc->input);
        gb_csv_status status = gb_csv_parse(pc->input, length, 100, &csv);
        if (status != GB_CSV_OK || csv.record_count != pc->records) {
            fail_msg("%s: status %d, %zu records (expected %zu)", pc->name, (int)status,
                     csv.record_count, pc->records);
        }
        for (size_t r = 0; r < pc->records; r++) {
            size_t n = 0;
            while (pc->fields[r][n] != NULL) {
                n++;
            }
            if (csv.records[r].field_count != n || csv.records[r].line != pc->lines[r] ||
                csv.records[r].malformed != pc->malformed[r] ||
                (pc->malformed[r] && csv.records[r].column != pc->columns[r])) {
                fail_msg("%s: record %zu has %zu fields, line %zu, malformed %d at %zu "
                         "(expected %zu, %zu, %d at %zu)",
                         pc->name, r, csv.records[r].field_count, csv.records[r].line,
                         (int)csv.records[r].malformed, csv.records[r].column, n, pc->lines[r],
                         (int)pc->malformed[r], pc->columns[r]);
            }
            for (size_t f = 0; f < n; f++) {
                if (strcmp(gb_csv_field(&csv, r, f), pc->fields[r][f]) != 0) {
                    fail_msg("%s: record %zu field %zu is \"%s\", expected \"%s\"", pc->name, r,
                             f, gb_csv_field(&csv, r, f), pc->fields[r][f]);
                }
            }
        }
        gb_csv_free(&csv);
    }
}

static void test_refused_texts(void **state)
{
    gb_csv csv;
    (void)state;
    assert_int_equal(gb_csv_parse("a,b\r\n1,\"open\r\n2,3\r\n", 19, 100, &csv),
                     GB_CSV_UNTERMINATED_QUOTE);
    assert_int_equal(csv.error_line, 2);
    gb_csv_free(&csv);
    /* Three records where two are allowed: refused, and reading stopped there. */
    assert_int_equal(gb_csv_parse("h\r\n1\r\n2\r\n", 9, 2, &csv), GB_CSV_TOO_MANY_RECORDS);
    gb_csv_free(&csv);
    assert_int_equal(gb_csv_parse("h\r\n1\r\n\r\n", 8, 2, &csv), GB_CSV_OK);
    assert_int_equal(csv.record_count, 2);
    gb_csv_free(&csv);
    assert_int_equal(gb_csv_parse("", 0, 2, &csv), GB_CSV_OK);
    assert_int_equal(csv.record_count, 0);
    gb_csv_free(&csv);
}

/* The input need not end with a NUL: only `length` bytes are read. */
static void test_reads_only_length_bytes(void **state)
{
    gb_csv csv;
    char buffer[8] = {'a', ',', 'b', 'X', 'X', 'X', 'X', 'X'};
    (void)state;
    assert_int_equal(gb_csv_parse(buffer, 3, 10, &csv), GB_CSV_OK);
    assert_int_equal(csv.record_count, 1);
    assert_string_equal(gb_csv_field(&csv, 0, 1), "b");
    gb_csv_free(&csv);
}

static void test_writer_quotes_what_needs_it(void **state)
{
    static const char *const fields[] = {"plain", "a,b", "say \"hi\"", "two\r\nlines",
                                         " padded", "", "-3.5e-2"};
    gb_jw w;
    size_t length = 0;
    char *text;
    (void)state;
    gb_jw_init(&w, 64);
    for (size_t i = 0; i < sizeof fields / sizeof fields[0]; i++) {
        gb_csv_write_field(&w, fields[i], i == 0);
    }
    gb_csv_end_record(&w);
    text = gb_jw_take(&w, &length);
    assert_string_equal(text,
                        "plain,\"a,b\",\"say \"\"hi\"\"\",\"two\r\nlines\",\" padded\",,-3.5e-2\r\n");
    /* And what was written reads back to the same fields. */
    {
        gb_csv csv;
        assert_int_equal(gb_csv_parse(text, length, 10, &csv), GB_CSV_OK);
        assert_int_equal(csv.record_count, 1);
        assert_int_equal(csv.records[0].field_count, sizeof fields / sizeof fields[0]);
        for (size_t i = 0; i < sizeof fields / sizeof fields[0]; i++) {
            assert_string_equal(gb_csv_field(&csv, 0, i), fields[i]);
        }
        gb_csv_free(&csv);
    }
    free(text);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_parse_cases),
        cmocka_unit_test(test_refused_texts),
        cmocka_unit_test(test_reads_only_length_bytes),
        cmocka_unit_test(test_writer_quotes_what_needs_it),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
