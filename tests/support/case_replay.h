/*
 * case_replay.h — the successful computations among the integration case
 * files (tests/integration/cases), as requests to send again and
 * expectations to check, for tests that replay them many times (load, soak,
 * restart).  Chosen: a /v1 path, expected status 200, expected `fields`, no
 * `fill` or `pad_body_to`, not `heavy` (heavy work may rightly be shed with
 * 503 under concurrent load: server/heavywork.h).  The expectations come from the case files (the
 * oracle's numbers), never from the server.
 */
#ifndef GREYBODY_TEST_CASE_REPLAY_H
#define GREYBODY_TEST_CASE_REPLAY_H

#include <curl/curl.h>
#include <jansson.h>
#include <stdbool.h>
#include <stddef.h>

#include "report_text.h"

typedef struct replay_case {
    char name[200];
    char method[8];
    char *path;
    char *body; /* NULL for GET */
    size_t body_length;
    struct curl_slist *headers; /* Content-Type and the case's own headers */
    json_t *fields;             /* JSON pointer -> expected value */
} replay_case;

/* Loads the chosen cases of `cases_dir` (sorted by file name); 0 on failure. */
size_t replay_load(const char *cases_dir, replay_case **cases);

/* Compares an answer with the case; differences go to `report`.  true when all hold. */
bool replay_check(const replay_case *one, long status, const char *body, size_t length,
                  report_text *report);

void replay_free(replay_case *cases, size_t count);
/* Releases what one case holds (for callers that drop cases from the array). */
void replay_free_one(replay_case *one);

#endif
