#include "vector_table.h"

#include <setjmp.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>

struct vector_table {
    char file[128];
    char *text;        /* the whole file; cells point into it */
    size_t columns;
    size_t rows;       /* data rows */
    char **cells;      /* (rows + 1) x columns, row 0 the header */
};

static char *read_whole_file(const char *path)
{
    FILE *stream = fopen(path, "rb");
    char *text;
    long size;
    if (stream == NULL) {
        fail_msg("cannot open %s (the tests run from the repository root)", path);
    }
    assert_int_equal(fseek(stream, 0, SEEK_END), 0);
    size = ftell(stream);
    assert_true(size > 0);
    rewind(stream);
    text = malloc((size_t)size + 1);
    assert_non_null(text);
    assert_int_equal(fread(text, 1, (size_t)size, stream), (size_t)size);
    fclose(stream);
    text[size] = '\0';
    return text;
}

static size_t count_cells(const char *line)
{
    size_t cells = 1;
    for (; *line != '\0' && *line != '\n'; ++line) {
        cells += *line == '\t';
    }
    return cells;
}

/* Splits one line in place into `columns` cells; false when the count differs. */
static int split_line(char *line, char **cells, size_t columns)
{
    size_t column = 0;
    for (char *cell = line;;) {
        char *tab = strchr(cell, '\t');
        if (column == columns) {
            return 0;
        }
        cells[column++] = cell;
        if (tab == NULL) {
            break;
        }
        *tab = '\0';
        cell = tab + 1;
    }
    return column == columns;
}

vector_table *vector_table_load(const char *file_name)
{
    char path[256];
    size_t lines = 0;
    vector_table *table = calloc(1, sizeof *table);
    assert_non_null(table);
    snprintf(table->file, sizeof table->file, "%s", file_name);
    snprintf(path, sizeof path, "%s%s", VECTOR_DIRECTORY, file_name);
    table->text = read_whole_file(path);
    for (const char *c = table->text; *c != '\0'; ++c) {
        lines += *c == '\n';
    }
    char *rest = NULL;
    for (char *line = strtok_r(table->text, "\n", &rest); line != NULL;
         line = strtok_r(NULL, "\n", &rest)) {
        if (line[0] == '#') {
            continue;
        }
        if (table->cells == NULL) {
            table->columns = count_cells(line);
            table->cells = calloc((lines + 1) * table->columns, sizeof *table->cells);
            assert_non_null(table->cells);
        } else {
            table->rows++;
        }
        if (!split_line(line, table->cells + table->rows * table->columns, table->columns)) {
            fail_msg("%s: row %zu does not have %zu cells", path, table->rows, table->columns);
        }
    }
    if (table->cells == NULL || table->rows == 0) {
        fail_msg("%s has no rows", path);
    }
    return table;
}

void vector_table_free(vector_table *table)
{
    if (table != NULL) {
        free(table->cells);
        free(table->text);
        free(table);
    }
}

size_t vector_table_rows(const vector_table *table)
{
    return table->rows;
}

const char *vector_table_file(const vector_table *table)
{
    return table->file;
}

const char *vector_table_text(const vector_table *table, size_t row, const char *column)
{
    assert_true(row < table->rows);
    for (size_t c = 0; c < table->columns; ++c) {
        if (strcmp(table->cells[c], column) == 0) {
            return table->cells[(row + 1) * table->columns + c];
        }
    }
    fail_msg("%s has no column %s", table->file, column);
    return "";
}

double vector_table_number(const vector_table *table, size_t row, const char *column)
{
    const char *text = vector_table_text(table, row, column);
    char *end;
    double value = strtod(text, &end); /* ERANGE on underflow is expected: 0 or a subnormal */
    if (end == text || *end != '\0') {
        fail_msg("%s row %zu column %s is not a number: '%s'", table->file, row, column, text);
    }
    return value;
}
