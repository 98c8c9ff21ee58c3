/*
 * csv.h — comma-separated values after RFC 4180: reading a whole text into
 * records and fields, and writing fields back.
 *
 * Reading (gb_csv_parse):
 *   - an optional UTF-8 byte-order mark (EF BB BF) at the start is skipped;
 *   - records end at CRLF, LF or a lone CR; a line with no characters at all
 *     is skipped (it is no record), and the last record needs no line break;
 *   - fields are separated by commas; a field that starts with a double
 *     quote runs to the matching closing quote and may hold commas, line
 *     breaks and doubled quotes ("" stands for one "); its line count is
 *     kept, so a record's `line` is where it starts;
 *   - spaces and tabs around an unquoted field are dropped (common practice
 *     for exported sheets: " 300" reads as "300"); inside quotes they stay;
 *   - a quote inside an unquoted field, text after a closing quote, or a NUL
 *     byte makes that record `malformed` (with the 1-based `column` where it
 *     went wrong); reading goes on at the next line break, so one bad record
 *     does not spoil the others;
 *   - a quoted field still open at the end of the text cannot be told apart
 *     from the records after it: the whole text is refused
 *     (GB_CSV_UNTERMINATED_QUOTE, with the line of the opening quote);
 *   - more than `max_records` records: GB_CSV_TOO_MANY_RECORDS (reading stops
 *     there, so the cost of a refused text is bounded too).
 * Field texts are NUL-terminated copies; the input is not changed and need
 * not be NUL-terminated.
 *
 * Writing (gb_csv_write_field, gb_csv_end_record): a field is quoted when it
 * holds a comma, a quote, CR, LF, leading or trailing blanks, or starts with
 * a byte-order mark, so that it reads back as written; records end with CRLF.
 *
 * Ownership: gb_csv_parse fills a gb_csv the caller releases with
 * gb_csv_free (also after a failure).
 */
#ifndef GREYBODY_CSV_H
#define GREYBODY_CSV_H

#include <stdbool.h>
#include <stddef.h>

#include "jsonw.h"

typedef enum gb_csv_status {
    GB_CSV_OK = 0,
    GB_CSV_UNTERMINATED_QUOTE,
    GB_CSV_TOO_MANY_RECORDS,
    GB_CSV_NO_MEMORY
} gb_csv_status;

typedef struct gb_csv_record {
    size_t first_field; /* index into the table's fields */
    size_t field_count;
    size_t line;        /* 1-based line of the text where the record starts */
    bool malformed;     /* a quote out of place or a NUL byte: fields are partial */
    size_t column;      /* malformed: 1-based character of the line where it went wrong */
} gb_csv_record;

typedef struct gb_csv {
    char *text;            /* the fields' texts, each NUL-terminated */
    size_t *field_offset;  /* start of each field in `text` */
    size_t field_count;
    gb_csv_record *records;
    size_t record_count;
    size_t error_line;     /* GB_CSV_UNTERMINATED_QUOTE: line of the opening quote */
    size_t field_capacity, record_capacity;
} gb_csv;

gb_csv_status gb_csv_parse(const char *input, size_t length, size_t max_records, gb_csv *csv);
void gb_csv_free(gb_csv *csv);

/* Field `field` of record `record` (both in range). */
const char *gb_csv_field(const gb_csv *csv, size_t record, size_t field);

/* Appends one field (preceded by a comma unless `first`). */
void gb_csv_write_field(gb_jw *w, const char *text, bool first);
/* Ends a record with CRLF. */
void gb_csv_end_record(gb_jw *w);

#endif
