/*
 * frame.h — whole thermal frames: a plane of float32 pixels (and optionally
 * a per-pixel emissivity map) in, a plane of float32 temperatures out.
 *
 * The measurement equation (measure.h) is solved pixel by pixel in blocks
 * small enough to stay in cache, through a band table (bandtable.h) wherever
 * the table covers the pixel, and through the exact band functions (band.h)
 * wherever it does not, so every pixel gets an answer whatever the table's
 * range.  The brightness-temperature form inverts Planck's law at one
 * spectral position prepared once (planck.h); the calibration form takes
 * instrument signals through a fitted calibration (calibration.h).
 *
 * A pixel without an answer -- an input out of domain, no net signal left
 * after the reflected and atmospheric terms, a result beyond the solver's
 * range -- is written as absolute zero in the frame's unit (0 K, -273.15 C,
 * -459.67 F): a finite value no surface can have, so no NaN ever reaches a
 * consumer's arithmetic.  Such pixels are counted in `unresolved` and their
 * statuses written to `pixel_status` when the caller wants them.
 *
 * Accuracy: a float32 answer carries 24 bits (relative spacing 6e-8); the
 * table's errors (<= 1e-8 relative, bandtable.h) and the exact functions'
 * are far below that, so each output is the correctly computed temperature
 * rounded to float32, up to one float32 step.
 * Nothing is allocated; thread-safe; disjoint slices of a frame may run on
 * separate threads.
 */
#ifndef GREYBODY_FRAME_H
#define GREYBODY_FRAME_H

#include <stddef.h>

#include "band.h"
#include "bandtable.h"
#include "calibration.h"
#include "measure.h"
#include "planck.h"
#include "status.h"
#include "units.h"

typedef struct gb_frame {
    size_t count;
    const float *signal;          /* count pixels */
    gb_term_kind signal_kind;     /* temperatures in `unit`, or radiances x radiance_scale */
    double radiance_scale;        /* radiance pixels -> the core's unit (1/pi for exitance) */
    const float *emissivity_map;  /* count pixels, or NULL: `emissivity` everywhere */
    double emissivity;
    gb_temperature_unit unit;     /* of temperature pixels and of the answer */
    float *temperature;           /* count pixels out; may be `signal` itself (in place) */
    unsigned char *pixel_status;  /* count gb_status values out, or NULL */
    size_t unresolved;            /* out: pixels without an answer */
} gb_frame;

/* The frame-wide terms of the measurement equation, worked out once. */
typedef struct gb_frame_terms {
    double reflected_radiance; /* L_refl, W m^-2 sr^-1 */
    double transmittance;
    double atmosphere_part;    /* A: (1 - tau) L(T_atm), or L_path */
} gb_frame_terms;

/*
 * The terms from the scene's reflected, transmittance and atmosphere members
 * (its signal and emissivity are not read), with measure.h's checks.
 */
gb_status gb_frame_prepare(const gb_band *band, const gb_scene *scene, gb_frame_terms *terms);

/*
 * The surface temperature of every pixel.  `table` may be NULL (exact band
 * functions everywhere, the natural choice for GB_BAND_TOTAL); otherwise it
 * must have been built for `band`.
 */
gb_status gb_frame_measure_temperature(const gb_band *band, const gb_band_table *table,
                                       const gb_frame_terms *terms, gb_frame *frame);

/* The brightness temperature of every pixel of spectral radiances at one position. */
gb_status gb_frame_brightness_temperature(const gb_planck_position *position, gb_frame *frame);

/*
 * The blackbody-equivalent temperature of every pixel of instrument signals
 * through a calibration (calibration.h, gb_calibration_apply with no signal
 * uncertainty): `signal` holds the instrument's own units; signal_kind,
 * radiance_scale, emissivity and emissivity_map are not read.  A signal no
 * temperature gives (<= 0 for Sakuma-Hattori, <= offset for the band model)
 * is a pixel without an answer, status GB_ERR_SIGNAL_OUT_OF_RANGE.  The
 * calibration itself is checked once (gb_calibration_check's statuses).
 * Band-model calibrations invert the exact band functions pixel by pixel:
 * correct, but far slower per pixel than Sakuma-Hattori's closed form.
 */
gb_status gb_frame_calibration_apply(const gb_calibration *calibration, gb_frame *frame);

#endif
