/*
 * prometheus_check.h — structural checks of a Prometheus text exposition
 * (format 0.0.4) that promtool does not make: # HELP and # TYPE before each
 * family's samples, one contiguous group per family, `_total` only on
 * counters, and for every histogram series cumulative buckets in increasing
 * `le` order ending in le="+Inf", that bucket equal to `_count`, and a `_sum`.
 * Also reports an exposition without any histogram.
 */
#ifndef GREYBODY_TEST_PROMETHEUS_CHECK_H
#define GREYBODY_TEST_PROMETHEUS_CHECK_H

#include "report_text.h"

/* Appends one line per problem found in `body` to `report`; adds nothing when all is well. */
void prometheus_check_exposition(const char *body, report_text *report);

#endif
