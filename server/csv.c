#include "csv.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

typedef struct reader {
    const char *in;
    size_t length;
    size_t pos;
    size_t line;
    size_t line_start; /* position of the current line's first character */
    gb_csv *csv;
    size_t text_used;
} reader;

static bool at_end(const reader *r)
{
    return r->pos >= r->length;
}

static bool at_line_break(const reader *r)
{
    return !at_end(r) && (r->in[r->pos] == '\r' || r->in[r->pos] == '\n');
}

static bool is_blank(char c)
{
    return c == ' ' || c == '\t';
}

/* Consumes CRLF, LF or a lone CR. */
static void take_line_break(reader *r)
{
    if (r->in[r->pos] == '\r' && r->pos + 1 < r->length && r->in[r->pos + 1] == '\n') {
        r->pos++;
    }
    r->pos++;
    r->line++;
    r->line_start = r->pos;
}

static void skip_blanks(reader *r)
{
    while (!at_end(r) && is_blank(r->in[r->pos])) {
        r->pos++;
    }
}

/* After a malformed field: on to the next line break, quotes or not. */
static void skip_rest_of_line(reader *r)
{
    while (!at_end(r) && !at_line_break(r)) {
        r->pos++;
    }
}

static bool grow(void **array, size_t *capacity, size_t needed, size_t size)
{
    size_t wanted = *capacity ? *capacity : 64;
    void *grown;
    if (needed <= *capacity) {
        return true;
    }
    while (wanted < needed) {
        if (wanted > SIZE_MAX / 2 / size) {
            return false;
        }
        wanted *= 2;
    }
    grown = realloc(*array, wanted * size);
    if (grown == NULL) {
        return false;
    }
    *array = grown;
    *capacity = wanted;
    return true;
}

static bool push_field(reader *r, size_t offset)
{
    gb_csv *csv = r->csv;
    if (!grow((void **)&csv->field_offset, &csv->field_capacity, csv->field_count + 1,
              sizeof *csv->field_offset)) {
        return false;
    }
    csv->text[r->text_used++] = '\0';
    csv->field_offset[csv->field_count++] = offset;
    return true;
}

static void mark_malformed(reader *r, gb_csv_record *record)
{
    if (!record->malformed) {
        record->malformed = true;
        record->column = r->pos - r->line_start + 1;
    }
    skip_rest_of_line(r);
}

/* A quoted field, from its opening quote; false when the text ends inside it. */
static bool quoted_field(reader *r, gb_csv_record *record)
{
    size_t opened = r->line;
    r->pos++;
    for (;;) {
        char c;
        if (at_end(r)) {
            r->csv->error_line = opened;
            return false;
        }
        c = r->in[r->pos];
        if (c == '"') {
            if (r->pos + 1 < r->length && r->in[r->pos + 1] == '"') {
                r->csv->text[r->text_used++] = '"';
                r->pos += 2;
                continue;
            }
            r->pos++;
            break;
        }
        if (c == '\0') {
            if (!record->malformed) {
                record->malformed = true;
                record->column = r->pos - r->line_start + 1;
            }
            r->pos++;
            continue;
        }
        r->csv->text[r->text_used++] = c;
        if (c == '\r' || c == '\n') {
            bool pair = c == '\r' && r->pos + 1 < r->length && r->in[r->pos + 1] == '\n';
            if (pair) {
                r->csv->text[r->text_used++] = '\n';
                r->pos++;
            }
            r->pos++;
            r->line++;
            r->line_start = r->pos;
            continue;
        }
        r->pos++;
    }
    skip_blanks(r);
    if (!at_end(r) && !at_line_break(r) && r->in[r->pos] != ',') {
        mark_malformed(r, record); /* text after the closing quote */
    }
    return true;
}

static void unquoted_field(reader *r, gb_csv_record *record)
{
    size_t start = r->text_used;
    while (!at_end(r) && !at_line_break(r) && r->in[r->pos] != ',') {
        char c = r->in[r->pos];
        if (c == '"' || c == '\0') {
            mark_malformed(r, record);
            break;
        }
        r->csv->text[r->text_used++] = c;
        r->pos++;
    }
    while (r->text_used > start && is_blank(r->csv->text[r->text_used - 1])) {
        r->text_used--;
    }
}

/* True when only blanks stand between here and the end of the line. */
static bool blank_line(const reader *r)
{
    size_t p = r->pos;
    while (p < r->length && is_blank(r->in[p])) {
        p++;
    }
    return p >= r->length || r->in[p] == '\r' || r->in[p] == '\n';
}

static gb_csv_status read_record(reader *r)
{
    gb_csv *csv = r->csv;
    gb_csv_record record = {csv->field_count, 0, r->line, false, 0};
    for (;;) {
        size_t offset = r->text_used;
        skip_blanks(r);
        if (!at_end(r) && r->in[r->pos] == '"') {
            if (!quoted_field(r, &record)) {
                return GB_CSV_UNTERMINATED_QUOTE;
            }
        } else {
            unquoted_field(r, &record);
        }
        if (!push_field(r, offset)) {
            return GB_CSV_NO_MEMORY;
        }
        record.field_count++;
        if (!at_end(r) && r->in[r->pos] == ',') {
            r->pos++;
            continue;
        }
        if (!at_end(r)) {
            take_line_break(r);
        }
        break;
    }
    if (!grow((void **)&csv->records, &csv->record_capacity, csv->record_count + 1,
              sizeof *csv->records)) {
        return GB_CSV_NO_MEMORY;
    }
    csv->records[csv->record_count++] = record;
    return GB_CSV_OK;
}

gb_csv_status gb_csv_parse(const char *input, size_t length, size_t max_records, gb_csv *csv)
{
    reader r = {input, length, 0, 1, 0, csv, 0};
    memset(csv, 0, sizeof *csv);
    /* Field texts are never longer than the input, plus one NUL per field. */
    if (length > (SIZE_MAX - 2) / 2) {
        return GB_CSV_NO_MEMORY;
    }
    csv->text = malloc(2 * length + 2);
    if (csv->text == NULL) {
        return GB_CSV_NO_MEMORY;
    }
    if (length >= 3 && memcmp(input, "\xEF\xBB\xBF", 3) == 0) {
        r.pos = 3;
        r.line_start = 3;
    }
    while (!at_end(&r)) {
        gb_csv_status status;
        if (blank_line(&r)) {
            skip_rest_of_line(&r);
            if (!at_end(&r)) {
                take_line_break(&r);
            }
            continue;
        }
        if (csv->record_count == max_records) {
            return GB_CSV_TOO_MANY_RECORDS;
        }
        status = read_record(&r);
        if (status != GB_CSV_OK) {
            return status;
        }
    }
    return GB_CSV_OK;
}

void gb_csv_free(gb_csv *csv)
{
    free(csv->text);
    free(csv->field_offset);
    free(csv->records);
    memset(csv, 0, sizeof *csv);
}

const char *gb_csv_field(const gb_csv *csv, size_t record, size_t field)
{
    return csv->text + csv->field_offset[csv->records[record].first_field + field];
}

void gb_csv_write_field(gb_jw *w, const char *text, bool first)
{
    size_t n = strlen(text);
    /* Blanks at the ends would be dropped, and a leading byte-order mark skipped, unquoted. */
    bool quote = strpbrk(text, ",\"\r\n") != NULL ||
                 (n > 0 && (is_blank(text[0]) || is_blank(text[n - 1]))) ||
                 strncmp(text, "\xEF\xBB\xBF", 3) == 0;
    if (!first) {
        gb_jw_raw(w, ",", 1);
    }
    if (!quote) {
        gb_jw_raw(w, text, n);
        return;
    }
    gb_jw_raw(w, "\"", 1);
    for (const char *p = text; *p != '\0'; p++) {
        gb_jw_raw(w, p, 1);
        if (*p == '"') {
            gb_jw_raw(w, "\"", 1);
        }
    }
    gb_jw_raw(w, "\"", 1);
}

void gb_csv_end_record(gb_jw *w)
{
    gb_jw_raw(w, "\r\n", 2);
}
