/*
 * csv_batch.h — batches of measurements as CSV (RFC 4180, csv.h), for lab
 * information systems and spreadsheets.
 *
 * POST /v1/corrected-temperature, /v1/sensitivity or /v1/calibration/apply
 * with Content-Type: text/csv (charset utf-8 or us-ascii when given):
 *   - the header row names the inputs with the names of the JSON form; query
 *     parameters apply to every row (band=8,14, temperature_unit=C, a whole
 *     calibration=<JSON text>), columns to their own row; a name may not be
 *     both;
 *   - columns whose name starts with "_" (_sample, _instrument) are carried
 *     through to the answer untouched and never read as inputs;
 *   - each row is one measurement, read like a GET query: scalar values, a
 *     band as "lo,hi" (quoted, it holds a comma), the calibration object as
 *     its JSON text; an empty cell means the input is not given in that row;
 *   - the answer (200, text/csv; charset=utf-8; header=present, CRLF) has the
 *     input columns as sent, then the result columns -- temperature (and
 *     combined_standard_uncertainty, expanded_uncertainty for sensitivity;
 *     u_temperature for calibration/apply), in the row's temperature_unit --
 *     and an `error` column: empty, or "<code> (<field>): <detail>" for a row
 *     that has no answer.  One bad row never fails the batch.
 * The batch as a whole is refused with a problem document for: a malformed
 * header (400 malformed_csv: empty or repeated column name, a quote out of
 * place), a column the endpoint does not know (400 unknown_field naming the
 * column), a column that is also a query parameter (400 conflicting_fields),
 * a quoted field left open (400 malformed_csv), more data rows than
 * --max-csv-rows (413 too_many_rows).
 */
#ifndef GREYBODY_CSV_BATCH_H
#define GREYBODY_CSV_BATCH_H

#include <stdbool.h>
#include <stddef.h>

#include "heavywork.h"
#include "reply.h"
#include "request.h"
#include "router.h"

#define GB_CONTENT_CSV "text/csv; charset=utf-8; header=present"

/* True for text/csv sent to a route that takes CSV batches. */
bool gb_csv_batch_accepts(const gb_route *route, const char *content_type);

/* Serves one CSV batch; takes the body (*body is set to NULL and freed here). */
void gb_csv_batch_serve(gb_context *context, struct MHD_Connection *connection,
                        const gb_route *route, char **body, size_t length, bool body_too_large,
                        gb_heavy_work *heavy, gb_reply *reply);

#endif
