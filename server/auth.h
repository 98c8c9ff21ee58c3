/*
 * auth.h — optional bearer-token authentication (RFC 6750).
 *
 * Off unless a token is configured: --auth-token-file names a file whose
 * first line is the token, or the environment variable GREYBODY_AUTH_TOKEN
 * holds the token itself (the file wins when both are set).  Tokens have 16
 * to GB_AUTH_TOKEN_MAX characters of the RFC 6750 token alphabet
 * (A-Z a-z 0-9 - . _ ~ + / and trailing =), so they travel in a header as is.
 *
 * When on, every request needs "Authorization: Bearer <token>", except
 * OPTIONS (a browser's CORS preflight never carries credentials) and the
 * paths of --auth-open-paths (default /healthz and /readyz, so that probes
 * keep working).  Tokens are compared in time that depends only on the
 * configured token's length, never on where the first difference lies.
 */
#ifndef GREYBODY_AUTH_H
#define GREYBODY_AUTH_H

#include <stdbool.h>
#include <stddef.h>

#include "config.h"

#define GB_AUTH_TOKEN_MIN 16
#define GB_AUTH_TOKEN_MAX 512
#define GB_AUTH_TOKEN_ENV "GREYBODY_AUTH_TOKEN"
#define GB_AUTH_REALM "greybody"

typedef struct gb_auth {
    bool enabled;
    char token[GB_AUTH_TOKEN_MAX + 1];
    size_t token_length;
    char open_paths[GB_CONFIG_TEXT_MAX]; /* comma list */
} gb_auth;

/* Reads the token (if any is configured).  false with a message naming the source. */
bool gb_auth_load(gb_auth *auth, const gb_config *config, char *error, size_t error_size);

/* Wipes the token from memory. */
void gb_auth_clear(gb_auth *auth);

typedef enum gb_auth_verdict {
    GB_AUTH_GRANTED = 0,
    GB_AUTH_MISSING, /* no bearer credentials */
    GB_AUTH_INVALID  /* bearer credentials that do not match */
} gb_auth_verdict;

/*
 * The verdict for a request to `path` (without the query string) with the
 * given Authorization header value (NULL when absent).  `is_preflight` is
 * true for OPTIONS.
 */
gb_auth_verdict gb_auth_check(const gb_auth *auth, const char *path, bool is_preflight,
                              const char *authorization);

/* The WWW-Authenticate value for a refusal (RFC 6750 section 3). */
const char *gb_auth_challenge(gb_auth_verdict verdict);

/* true when the two byte strings are equal; time depends on expected_length only. */
bool gb_auth_tokens_equal(const char *given, size_t given_length, const char *expected,
                          size_t expected_length);

#endif
