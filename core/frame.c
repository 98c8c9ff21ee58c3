#include "frame.h"

#include <math.h>

/* Pixels per block: three double arrays and the statuses stay within a few KiB of stack. */
#define BLOCK 256

/* The block's working numbers, one array per stage. */
struct block {
    size_t size;
    double signal_kelvin[BLOCK];
    double signal_radiance[BLOCK];
    double surface_radiance[BLOCK];
    double kelvin[BLOCK];
    gb_status pixel[BLOCK];  /* the pixel's own status */
    gb_status lookup[BLOCK]; /* the table's status: not GB_OK means "ask band.h" */
};

static int frame_invalid(const gb_frame *frame)
{
    return frame == NULL || frame->count == 0 || frame->signal == NULL ||
           frame->temperature == NULL;
}

static double pixel_emissivity(const gb_frame *frame, size_t index)
{
    return frame->emissivity_map != NULL ? (double)frame->emissivity_map[index]
                                         : frame->emissivity;
}

/* Writes one answer (or absolute zero) and its status. */
static void emit(gb_frame *frame, size_t index, gb_status status, double kelvin)
{
    double value = 0.0;
    if (status == GB_OK) {
        status = gb_temperature_from_kelvin(kelvin, frame->unit, &value);
    }
    if (status != GB_OK) {
        (void)gb_temperature_from_kelvin(0.0, frame->unit, &value);
        frame->unresolved++;
    }
    frame->temperature[index] = (float)value;
    if (frame->pixel_status != NULL) {
        frame->pixel_status[index] = (unsigned char)status;
    }
}

gb_status gb_frame_prepare(const gb_band *band, const gb_scene *scene, gb_frame_terms *terms)
{
    gb_scene known;
    gb_measurement m;
    gb_status status;
    if (scene == NULL || terms == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    /* measure.h checks a whole scene; the per-pixel members get harmless stand-ins. */
    known = *scene;
    known.signal.kind = GB_TERM_RADIANCE;
    known.signal.value = 1.0;
    known.emissivity = 1.0;
    status = gb_measure_terms(band, &known, &m);
    if (status != GB_OK) {
        return status;
    }
    terms->reflected_radiance = m.reflected_radiance;
    terms->transmittance = scene->transmittance;
    terms->atmosphere_part = m.atmosphere_part;
    return GB_OK;
}

/* Stage 1: each pixel's signal as a band radiance. */
static void signal_radiances(const gb_band *band, const gb_band_table *table,
                             const gb_frame *frame, size_t first, struct block *b)
{
    if (frame->signal_kind == GB_TERM_RADIANCE) {
        for (size_t j = 0; j < b->size; ++j) {
            double radiance = (double)frame->signal[first + j] * frame->radiance_scale;
            b->signal_radiance[j] = radiance;
            b->pixel[j] = !isfinite(radiance) ? GB_ERR_NOT_FINITE
                          : radiance > 0.0     ? GB_OK
                                               : GB_ERR_RADIANCE_DOMAIN;
        }
        return;
    }
    for (size_t j = 0; j < b->size; ++j) {
        double kelvin = NAN;
        b->pixel[j] = gb_temperature_to_kelvin((double)frame->signal[first + j], frame->unit,
                                               &kelvin);
        b->signal_kelvin[j] = kelvin;
    }
    if (table != NULL) {
        (void)gb_band_table_radiance_array(table, b->size, b->signal_kelvin, b->signal_radiance,
                                           b->lookup);
    }
    for (size_t j = 0; j < b->size; ++j) {
        if (b->pixel[j] == GB_OK && (table == NULL || b->lookup[j] != GB_OK)) {
            b->pixel[j] = gb_band_radiance(band, b->signal_kelvin[j], &b->signal_radiance[j],
                                           NULL);
        }
    }
}

/* Stage 2: the measurement equation solved for the surface's own band radiance. */
static void surface_radiances(const gb_frame_terms *terms, const gb_frame *frame, size_t first,
                              struct block *b)
{
    double tau = terms->transmittance;
    for (size_t j = 0; j < b->size; ++j) {
        double emissivity = pixel_emissivity(frame, first + j);
        double net = b->signal_radiance[j] - tau * (1.0 - emissivity) * terms->reflected_radiance -
                     terms->atmosphere_part;
        double surface = net / (tau * emissivity);
        if (b->pixel[j] == GB_OK) {
            b->pixel[j] = !isfinite(emissivity)                      ? GB_ERR_NOT_FINITE
                          : !(emissivity > 0.0 && emissivity <= 1.0) ? GB_ERR_EMISSIVITY_DOMAIN
                          : !(surface > 0.0)                         ? GB_ERR_NET_SIGNAL_NOT_POSITIVE
                                                                     : GB_OK;
        }
        /* A failed pixel looks up nothing: NaN is refused at once by the table. */
        b->surface_radiance[j] = b->pixel[j] == GB_OK ? surface : NAN;
    }
}

/* Stage 3: band radiance -> temperature. */
static void surface_temperatures(const gb_band *band, const gb_band_table *table,
                                 struct block *b)
{
    if (table != NULL) {
        (void)gb_band_table_temperature_array(table, b->size, b->surface_radiance, b->kelvin,
                                              b->lookup);
    } else {
        for (size_t j = 0; j < b->size; ++j) {
            b->kelvin[j] = 0.0;
        }
    }
    for (size_t j = 0; j < b->size; ++j) {
        if (b->pixel[j] == GB_OK && (table == NULL || b->lookup[j] != GB_OK)) {
            b->pixel[j] = gb_band_temperature(band, b->surface_radiance[j], 1.0, &b->kelvin[j]);
        }
    }
}

gb_status gb_frame_measure_temperature(const gb_band *band, const gb_band_table *table,
                                       const gb_frame_terms *terms, gb_frame *frame)
{
    struct block b;
    gb_status status;
    if (frame_invalid(frame) || terms == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_band_validate(band);
    if (status != GB_OK) {
        return status;
    }
    frame->unresolved = 0;
    for (size_t first = 0; first < frame->count; first += BLOCK) {
        b.size = frame->count - first < BLOCK ? frame->count - first : BLOCK;
        signal_radiances(band, table, frame, first, &b);
        surface_radiances(terms, frame, first, &b);
        surface_temperatures(band, table, &b);
        for (size_t j = 0; j < b.size; ++j) {
            emit(frame, first + j, b.pixel[j], b.kelvin[j]);
        }
    }
    return GB_OK;
}

gb_status gb_frame_brightness_temperature(const gb_planck_position *position, gb_frame *frame)
{
    if (frame_invalid(frame) || position == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    frame->unresolved = 0;
    for (size_t i = 0; i < frame->count; ++i) {
        double kelvin = 0.0;
        gb_status status = gb_brightness_temperature_prepared(
            position, (double)frame->signal[i] * frame->radiance_scale,
            pixel_emissivity(frame, i), &kelvin);
        emit(frame, i, status, kelvin);
    }
    return GB_OK;
}

gb_status gb_frame_calibration_apply(const gb_calibration *calibration, gb_frame *frame)
{
    gb_status status;
    if (frame_invalid(frame)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_calibration_check(calibration);
    if (status != GB_OK) {
        return status;
    }
    frame->unresolved = 0;
    for (size_t i = 0; i < frame->count; ++i) {
        double kelvin = 0.0, unused_uncertainty = 0.0;
        status = gb_calibration_apply(calibration, (double)frame->signal[i], 0.0, &kelvin,
                                      &unused_uncertainty);
        emit(frame, i, status, kelvin);
    }
    return GB_OK;
}
