#include "status_expect.h"

#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#define IDENTIFIER(status) [status] = #status

static const char *const identifiers[GB_STATUS_COUNT] = {
    IDENTIFIER(GB_OK),
    IDENTIFIER(GB_ERR_NOT_FINITE),
    IDENTIFIER(GB_ERR_INVALID_ARGUMENT),
    IDENTIFIER(GB_ERR_TEMPERATURE_DOMAIN),
    IDENTIFIER(GB_ERR_SPECTRAL_DOMAIN),
    IDENTIFIER(GB_ERR_RADIANCE_DOMAIN),
    IDENTIFIER(GB_ERR_EMISSIVITY_DOMAIN),
    IDENTIFIER(GB_ERR_TRANSMITTANCE_DOMAIN),
    IDENTIFIER(GB_ERR_UNCERTAINTY_DOMAIN),
    IDENTIFIER(GB_ERR_BAND_LIMITS),
    IDENTIFIER(GB_ERR_BAND_REVERSED),
    IDENTIFIER(GB_ERR_RESPONSE_TOO_SHORT),
    IDENTIFIER(GB_ERR_RESPONSE_UNSORTED),
    IDENTIFIER(GB_ERR_RESPONSE_NEGATIVE),
    IDENTIFIER(GB_ERR_RESPONSE_ALL_ZERO),
    IDENTIFIER(GB_ERR_RADIANCE_OUT_OF_RANGE),
    IDENTIFIER(GB_ERR_NET_SIGNAL_NOT_POSITIVE),
    IDENTIFIER(GB_ERR_RESULT_OVERFLOW),
    IDENTIFIER(GB_ERR_NO_CONVERGENCE),
    IDENTIFIER(GB_ERR_EMISSIVITY_UNDETERMINED),
    IDENTIFIER(GB_ERR_RATIO_UNREACHABLE),
    IDENTIFIER(GB_ERR_DRAW_COUNT),
    IDENTIFIER(GB_ERR_DISTRIBUTION_UNKNOWN),
    IDENTIFIER(GB_ERR_CALIBRATION_TOO_FEW_POINTS),
    IDENTIFIER(GB_ERR_CALIBRATION_DEGENERATE),
    IDENTIFIER(GB_ERR_CALIBRATION_NOT_MONOTONIC),
    IDENTIFIER(GB_ERR_CALIBRATION_NO_FIT),
    IDENTIFIER(GB_ERR_UNCERTAINTY_PARTIAL),
    IDENTIFIER(GB_ERR_SIGNAL_OUT_OF_RANGE),
};

gb_status status_from_identifier(const char *identifier)
{
    for (int status = 0; status < GB_STATUS_COUNT; ++status) {
        if (identifiers[status] != NULL && strcmp(identifiers[status], identifier) == 0) {
            return (gb_status)status;
        }
    }
    fail_msg("unknown status identifier '%s'", identifier);
    return GB_STATUS_COUNT;
}

const char *status_identifier(gb_status status)
{
    if ((unsigned)status >= (unsigned)GB_STATUS_COUNT || identifiers[status] == NULL) {
        return "(unknown)";
    }
    return identifiers[status];
}

void assert_status(gb_status got, gb_status expected, const char *what)
{
    if (got != expected) {
        fail_msg("%s: status %s, expected %s", what, status_identifier(got),
                 status_identifier(expected));
    }
}
