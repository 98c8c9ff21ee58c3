#include "status.h"

#include <stddef.h>

struct status_entry {
    const char *name;
    const char *text;
};

static const struct status_entry status_table[GB_STATUS_COUNT] = {
    [GB_OK] = {"ok", "Success."},
    [GB_ERR_NOT_FINITE] = {"not_finite", "A number is not finite (NaN or infinity)."},
    [GB_ERR_INVALID_ARGUMENT] = {"invalid_argument", "An argument is missing or malformed."},
    [GB_ERR_TEMPERATURE_DOMAIN] = {"temperature_out_of_range",
                                   "Temperature must be above 0 K and at most 1e9 K."},
    [GB_ERR_SPECTRAL_DOMAIN] = {"spectral_position_out_of_range",
                                "Wavelength, wavenumber and frequency must be positive."},
    [GB_ERR_RADIANCE_DOMAIN] = {"radiance_out_of_range", "Radiance must be positive."},
    [GB_ERR_EMISSIVITY_DOMAIN] = {"emissivity_out_of_range",
                                  "Emissivity must be greater than 0 and at most 1."},
    [GB_ERR_TRANSMITTANCE_DOMAIN] = {"transmittance_out_of_range",
                                     "Transmittance must be greater than 0 and at most 1."},
    [GB_ERR_UNCERTAINTY_DOMAIN] = {"uncertainty_negative",
                                   "A standard uncertainty cannot be negative."},
    [GB_ERR_BAND_LIMITS] = {"band_limit_out_of_range", "Band limits must be positive."},
    [GB_ERR_BAND_REVERSED] = {"band_reversed",
                              "Band limits must be given low to high and must differ."},
    [GB_ERR_RESPONSE_TOO_SHORT] = {"response_too_short",
                                   "A spectral response needs at least 2 points."},
    [GB_ERR_RESPONSE_UNSORTED] = {"response_unsorted",
                                  "Spectral response wavelengths must be strictly increasing."},
    [GB_ERR_RESPONSE_NEGATIVE] = {"response_negative",
                                  "Spectral response values cannot be negative."},
    [GB_ERR_RESPONSE_ALL_ZERO] = {"response_all_zero",
                                  "A spectral response needs at least one value above 0."},
    [GB_ERR_RADIANCE_OUT_OF_RANGE] = {"radiance_unreachable",
                                      "No temperature in the supported range gives this "
                                      "radiance here."},
    [GB_ERR_NET_SIGNAL_NOT_POSITIVE] = {"net_signal_not_positive",
                                        "After removing the reflected and atmospheric parts no "
                                        "signal from the surface is left; the surface temperature "
                                        "cannot be recovered."},
    [GB_ERR_RESULT_OVERFLOW] = {"result_overflow", "The result is too large to represent."},
    [GB_ERR_NO_CONVERGENCE] = {"no_convergence", "The solver did not converge."},
    [GB_ERR_EMISSIVITY_UNDETERMINED] = {"emissivity_undetermined",
                                        "The surface at its true temperature and its surroundings "
                                        "give the same radiance, so no emissivity can be read; "
                                        "raise the contrast between surface and background."},
    [GB_ERR_RATIO_UNREACHABLE] = {"ratio_unreachable",
                                  "No temperature between 0.1 K and 1e6 K gives this signal ratio."},
    [GB_ERR_DRAW_COUNT] = {"draw_count_out_of_range",
                           "The number of Monte Carlo draws is outside the allowed range."},
    [GB_ERR_DISTRIBUTION_UNKNOWN] = {"distribution_unknown",
                                     "An input distribution must be normal or rectangular."},
    [GB_ERR_CALIBRATION_TOO_FEW_POINTS] = {"calibration_too_few_points",
                                           "The model needs at least one more calibration point "
                                           "than it has parameters."},
    [GB_ERR_CALIBRATION_DEGENERATE] = {"calibration_degenerate",
                                       "The points have too few distinct temperatures to "
                                       "determine the model."},
    [GB_ERR_CALIBRATION_NOT_MONOTONIC] = {"calibration_not_monotonic",
                                          "The signal must rise strictly with the source "
                                          "temperature."},
    [GB_ERR_CALIBRATION_NO_FIT] = {"calibration_no_fit",
                                   "The fit did not converge to a usable model for these points."},
    [GB_ERR_UNCERTAINTY_PARTIAL] = {"uncertainty_partial",
                                    "Give uncertainties for every calibration point or for none."},
    [GB_ERR_SIGNAL_OUT_OF_RANGE] = {"signal_out_of_range",
                                    "No temperature gives this signal under the calibration."},
};

static const struct status_entry *entry_for(gb_status status)
{
    if ((unsigned)status >= (unsigned)GB_STATUS_COUNT) {
        return NULL;
    }
    return &status_table[status];
}

const char *gb_status_name(gb_status status)
{
    const struct status_entry *entry = entry_for(status);
    return entry ? entry->name : "unknown_status";
}

const char *gb_status_text(gb_status status)
{
    const struct status_entry *entry = entry_for(status);
    return entry ? entry->text : "Unknown status.";
}
