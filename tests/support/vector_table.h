/*
 * vector_table.h — reads a reference vector file of tests/reference/vectors/
 * (written by tests/reference/generate.py): a header line of column names,
 * then one tab-separated row per case; lines starting with '#' are comments.
 * Paths are relative to the repository root, where tools/run-tests.sh runs
 * the tests.
 *
 * Ownership: vector_table_load() returns a table the caller releases with
 * vector_table_free().  Anything malformed (missing file, ragged row, unknown
 * column, a number cell that is not a number) fails the running cmocka test.
 */
#ifndef GREYBODY_TEST_VECTOR_TABLE_H
#define GREYBODY_TEST_VECTOR_TABLE_H

#include <stddef.h>

#define VECTOR_DIRECTORY "tests/reference/vectors/"

typedef struct vector_table vector_table;

/* Loads VECTOR_DIRECTORY/file_name; never returns NULL. */
vector_table *vector_table_load(const char *file_name);
void vector_table_free(vector_table *table);

/* Data rows, not counting the header. */
size_t vector_table_rows(const vector_table *table);
const char *vector_table_file(const vector_table *table);

/* The cell of `row` under the column named `column`. */
const char *vector_table_text(const vector_table *table, size_t row, const char *column);
/* The same cell as a double ("nan" where the generator had no value; underflow gives 0). */
double vector_table_number(const vector_table *table, size_t row, const char *column);

#endif
