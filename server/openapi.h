/*
 * openapi.h — the OpenAPI document served at GET /openapi.json.
 *
 * The contract is api-docs/openapi.yaml; its JSON form api-docs/openapi.json
 * is produced at build time (or committed beside it).  The server reads that
 * file once, checks that it is JSON, and serves the bytes as they are.  With
 * no configured path it looks for api-docs/openapi.json in the working
 * directory, then beside the directory holding the binary (build/..).  If the
 * file is missing at start it is looked for again, at most once a second, on
 * request; until then /openapi.json answers 503.
 *
 * The loaded document lives until the process ends and is never replaced.
 */
#ifndef GREYBODY_OPENAPI_H
#define GREYBODY_OPENAPI_H

#include <stdbool.h>
#include <stddef.h>

/* Tries to load the document; true when it is available.  Thread-safe. */
bool gb_openapi_load(const char *configured_path);

/* The document (NULL if unavailable: a load is retried first). */
const char *gb_openapi_document(const char *configured_path, size_t *length);

/* The document's info.version (the contract's version), or NULL if unavailable. */
const char *gb_openapi_api_version(const char *configured_path);

/* Where the document was (or would be) read from, for the startup log. */
const char *gb_openapi_source(void);

#endif
