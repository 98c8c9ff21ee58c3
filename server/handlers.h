/* handlers.h — one handler per endpoint; see router.c for the paths. */
#ifndef GREYBODY_HANDLERS_H
#define GREYBODY_HANDLERS_H

#include "router.h"

/* handlers_conversion.c */
void gb_handle_radiance(const gb_call *call, gb_reply *reply);
void gb_handle_brightness_temperature(const gb_call *call, gb_reply *reply);
void gb_handle_peak(const gb_call *call, gb_reply *reply);

/* handlers_band.c */
void gb_handle_band(const gb_call *call, gb_reply *reply);
void gb_handle_band_temperature(const gb_call *call, gb_reply *reply);

/* handlers_measure.c */
void gb_handle_corrected_temperature(const gb_call *call, gb_reply *reply);
void gb_handle_sensitivity(const gb_call *call, gb_reply *reply);

/* handlers_emissivity.c, handlers_ratio.c, handlers_spectrum.c, handlers_presets.c */
void gb_handle_emissivity(const gb_call *call, gb_reply *reply);
void gb_handle_ratio_temperature(const gb_call *call, gb_reply *reply);
void gb_handle_spectrum(const gb_call *call, gb_reply *reply);
void gb_handle_presets(const gb_call *call, gb_reply *reply);

/* handlers_ops.c */
void gb_handle_healthz(const gb_call *call, gb_reply *reply);
void gb_handle_readyz(const gb_call *call, gb_reply *reply);
void gb_handle_version(const gb_call *call, gb_reply *reply);
void gb_handle_metrics(const gb_call *call, gb_reply *reply);
void gb_handle_openapi(const gb_call *call, gb_reply *reply);

/* handlers_calibration.c */
void gb_handle_calibration_fit(const gb_call *call, gb_reply *reply);
void gb_handle_calibration_apply(const gb_call *call, gb_reply *reply);

/* handlers_page.c */
void gb_handle_page(const gb_call *call, gb_reply *reply);

#endif
