/*
 * reply_check.h — what every fuzz harness asserts about an answer, and the
 * configuration the harnesses run the handlers with.
 *
 * An answer must have a status from 200 to 499 (never a 5xx, whatever the
 * input), a body that is one JSON object (application/json or
 * application/problem+json) holding only finite numbers, and, for a
 * problem, the RFC 9457 members with "status" equal to the HTTP status and
 * a "code".  A violation prints the input and the answer and aborts, which
 * libFuzzer reports as a crash and saves the input.
 */
#ifndef GREYBODY_FUZZ_REPLY_CHECK_H
#define GREYBODY_FUZZ_REPLY_CHECK_H

#include <stddef.h>
#include <stdint.h>

#include "config.h"
#include "reply.h"
#include "router.h"

/*
 * The server's defaults with the per-request work made small (short arrays,
 * few Monte Carlo draws, small spectra), so that every input runs in
 * milliseconds and a libFuzzer timeout means a real hang.  Also seeds
 * jansson and installs the presets of shared/ when they can be read.
 */
const gb_config *fuzz_config(void);

/* The /v1 route named by `path`, or, for any other text, one chosen from its bytes. */
const gb_route *fuzz_pick_route(const char *path);

/* Checks `reply` (see above); aborts on a violation.  Releases the reply. */
void fuzz_check_reply(gb_reply *reply, const gb_route *route, const uint8_t *input, size_t size);

#endif
