/*
 * status.h — the one status type of the greybody core.
 *
 * Every core function returns a gb_status and writes its results through
 * out-pointers; on any status other than GB_OK the out-pointers are left
 * untouched.  gb_status_name() gives a stable machine-readable code (used as
 * the problem-document `code` by the server); gb_status_text() a sentence for
 * people.  Both return pointers to static constant strings.
 */
#ifndef GREYBODY_STATUS_H
#define GREYBODY_STATUS_H

typedef enum gb_status {
    GB_OK = 0,
    GB_ERR_NOT_FINITE,              /* an input is NaN or infinite */
    GB_ERR_INVALID_ARGUMENT,        /* null pointer, zero length, unknown enum value */
    GB_ERR_TEMPERATURE_DOMAIN,      /* temperature <= 0 K or above GB_TEMPERATURE_MAX */
    GB_ERR_SPECTRAL_DOMAIN,         /* wavelength, wavenumber or frequency <= 0 */
    GB_ERR_RADIANCE_DOMAIN,         /* radiance or exitance <= 0 where a positive one is needed */
    GB_ERR_EMISSIVITY_DOMAIN,       /* emissivity outside (0, 1] */
    GB_ERR_TRANSMITTANCE_DOMAIN,    /* transmittance outside (0, 1] */
    GB_ERR_UNCERTAINTY_DOMAIN,      /* a standard uncertainty < 0 */
    GB_ERR_BAND_LIMITS,             /* a band limit <= 0 */
    GB_ERR_BAND_REVERSED,           /* band limits not strictly increasing */
    GB_ERR_RESPONSE_TOO_SHORT,      /* spectral response table with fewer than 2 points */
    GB_ERR_RESPONSE_UNSORTED,       /* response wavelengths not strictly increasing */
    GB_ERR_RESPONSE_NEGATIVE,       /* a response value < 0 */
    GB_ERR_RESPONSE_ALL_ZERO,       /* every response value is 0 */
    GB_ERR_RADIANCE_OUT_OF_RANGE,   /* no temperature in the solver's range gives this radiance */
    GB_ERR_NET_SIGNAL_NOT_POSITIVE, /* after removing reflected and atmospheric terms nothing is left */
    GB_ERR_RESULT_OVERFLOW,         /* the result is too large for a double */
    GB_ERR_NO_CONVERGENCE,          /* an iteration did not converge (a defect: please report) */
    GB_ERR_EMISSIVITY_UNDETERMINED, /* surface and surroundings give the same radiance */
    GB_ERR_RATIO_UNREACHABLE,       /* no temperature gives this two-colour signal ratio */
    GB_ERR_DRAW_COUNT,              /* Monte Carlo draw count outside the allowed range */
    GB_ERR_DISTRIBUTION_UNKNOWN,    /* an input distribution that is not normal or rectangular */
    GB_ERR_CALIBRATION_TOO_FEW_POINTS, /* fewer points than the model has parameters, plus one */
    GB_ERR_CALIBRATION_DEGENERATE,  /* too few distinct temperatures to determine the model */
    GB_ERR_CALIBRATION_NOT_MONOTONIC, /* signal does not rise with temperature */
    GB_ERR_CALIBRATION_NO_FIT,      /* the fit did not converge to a usable model */
    GB_ERR_UNCERTAINTY_PARTIAL,     /* uncertainties given for some points but not all */
    GB_ERR_SIGNAL_OUT_OF_RANGE,     /* no temperature gives this signal under the calibration */
    GB_STATUS_COUNT
} gb_status;

/* Stable snake_case code, e.g. "emissivity_out_of_range". Never NULL. */
const char *gb_status_name(gb_status status);

/* One sentence in plain English. Never NULL. */
const char *gb_status_text(gb_status status);

#endif
