#include "bandtable.h"

#include <math.h>

#define EDGE_SLACK 1e-9

/*
 * The cubic Hermite polynomial of one interval, from the values and slopes
 * (per unit of the grid coordinate) at its ends, as coefficients of powers of
 * the fraction t in [0, 1] of the step: one 32-byte load and three
 * multiply-adds per lookup.
 */
static void hermite_coefficients(double value0, double slope0, double value1, double slope1,
                                 double step, double coefficients[4])
{
    double d0 = step * slope0, d1 = step * slope1;
    coefficients[0] = value0;
    coefficients[1] = d0;
    coefficients[2] = 3.0 * (value1 - value0) - 2.0 * d0 - d1;
    coefficients[3] = 2.0 * (value0 - value1) + d0 + d1;
}

/* The interpolant at `position` steps from the grid's start, clamped into the grid. */
static double hermite(const double (*coefficients)[4], size_t intervals, double position)
{
    size_t node;
    double t;
    const double *c;
    position = position > 0.0 ? position : 0.0;
    node = (size_t)position;
    if (node >= intervals) {
        node = intervals - 1;
    }
    t = position - (double)node;
    c = coefficients[node];
    return ((c[3] * t + c[2]) * t + c[1]) * t + c[0];
}

gb_status gb_band_table_build(const gb_band *band, double t_min, double t_max,
                              gb_band_table *table)
{
    double forward_last = (double)(GB_BAND_TABLE_FORWARD_NODES - 1);
    double inverse_last = (double)(GB_BAND_TABLE_INVERSE_NODES - 1);
    double y_max, radiance, derivative, value, slope, previous_value = 0.0, previous_slope = 0.0;
    gb_status status;
    if (table == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(t_min) || !isfinite(t_max)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(t_min >= GB_BAND_TEMPERATURE_MIN && t_max <= GB_BAND_TEMPERATURE_MAX &&
          t_min < t_max)) {
        return GB_ERR_TEMPERATURE_DOMAIN;
    }
    status = gb_band_validate(band);
    if (status != GB_OK) {
        return status;
    }
    table->band = *band;
    table->t_min = t_min;
    table->t_max = t_max;
    table->u_min = 1.0 / t_max;
    table->u_step = (1.0 / t_min - table->u_min) / forward_last;
    table->u_scale = 1.0 / table->u_step;
    y_max = 0.0;
    for (size_t i = 0; i < GB_BAND_TABLE_FORWARD_NODES; ++i) {
        double temperature = i == 0 ? t_max
                                    : i + 1 == GB_BAND_TABLE_FORWARD_NODES
                                          ? t_min
                                          : 1.0 / (table->u_min + (double)i * table->u_step);
        status = gb_band_radiance(band, temperature, &radiance, &derivative);
        if (status != GB_OK) {
            return status;
        }
        if (!(radiance > 0.0)) {
            /* The band's radiance underflows at t_min: the table cannot reach that low. */
            return GB_ERR_TEMPERATURE_DOMAIN;
        }
        value = log(radiance);
        /* dy/du = (dL/dT / L) dT/du = -(dL/dT / L) T^2 */
        slope = -temperature * temperature * derivative / radiance;
        if (i == 0) {
            y_max = value;
        } else {
            hermite_coefficients(previous_value, previous_slope, value, slope, table->u_step,
                                 table->forward[i - 1]);
        }
        previous_value = value;
        previous_slope = slope;
    }
    table->y_min = previous_value;
    table->y_step = (y_max - table->y_min) / inverse_last;
    table->y_scale = 1.0 / table->y_step;
    for (size_t i = 0; i < GB_BAND_TABLE_INVERSE_NODES; ++i) {
        double temperature;
        if (i == 0) {
            temperature = t_min;
        } else if (i + 1 == GB_BAND_TABLE_INVERSE_NODES) {
            temperature = t_max;
        } else {
            status = gb_band_temperature(band, exp(table->y_min + (double)i * table->y_step), 1.0,
                                         &temperature);
            if (status != GB_OK) {
                return status;
            }
        }
        status = gb_band_radiance(band, temperature, &radiance, &derivative);
        if (status != GB_OK) {
            return status;
        }
        slope = radiance / derivative; /* dT/dy = L / (dL/dT) */
        if (i > 0) {
            hermite_coefficients(previous_value, previous_slope, temperature, slope,
                                 table->y_step, table->inverse[i - 1]);
        }
        previous_value = temperature;
        previous_slope = slope;
    }
    return GB_OK;
}

/* One forward lookup; the table is valid here. */
static gb_status lookup_radiance(const gb_band_table *table, double temperature_k,
                                 double *radiance)
{
    double position;
    if (!(temperature_k >= table->t_min && temperature_k <= table->t_max)) {
        return isnan(temperature_k) ? GB_ERR_NOT_FINITE : GB_ERR_TEMPERATURE_DOMAIN;
    }
    position = (1.0 / temperature_k - table->u_min) * table->u_scale;
    *radiance = exp(hermite(table->forward, GB_BAND_TABLE_FORWARD_NODES - 1, position));
    return GB_OK;
}

/* One inverse lookup; the table is valid here. */
static gb_status lookup_temperature(const gb_band_table *table, double radiance,
                                    double *temperature_k)
{
    double y, position;
    if (!(radiance > 0.0)) {
        return isnan(radiance) ? GB_ERR_NOT_FINITE : GB_ERR_RADIANCE_DOMAIN;
    }
    y = log(radiance);
    position = (y - table->y_min) * table->y_scale;
    /* The end radiances themselves may land a rounding outside the grid. */
    if (!(position >= -EDGE_SLACK &&
          position <= (double)(GB_BAND_TABLE_INVERSE_NODES - 1) + EDGE_SLACK)) {
        return isfinite(y) ? GB_ERR_RADIANCE_OUT_OF_RANGE : GB_ERR_NOT_FINITE;
    }
    *temperature_k = hermite(table->inverse, GB_BAND_TABLE_INVERSE_NODES - 1, position);
    return GB_OK;
}

gb_status gb_band_table_radiance(const gb_band_table *table, double temperature_k,
                                 double *radiance)
{
    if (table == NULL || radiance == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    return lookup_radiance(table, temperature_k, radiance);
}

gb_status gb_band_table_temperature(const gb_band_table *table, double radiance,
                                    double *temperature_k)
{
    if (table == NULL || temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    return lookup_temperature(table, radiance, temperature_k);
}

gb_status gb_band_table_radiance_array(const gb_band_table *table, size_t count,
                                       const double *temperature_k, double *radiance,
                                       gb_status *element_status)
{
    if (table == NULL || count == 0 || temperature_k == NULL || radiance == NULL ||
        element_status == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    for (size_t i = 0; i < count; ++i) {
        double value = 0.0;
        element_status[i] = lookup_radiance(table, temperature_k[i], &value);
        radiance[i] = value;
    }
    return GB_OK;
}

gb_status gb_band_table_temperature_array(const gb_band_table *table, size_t count,
                                          const double *radiance, double *temperature_k,
                                          gb_status *element_status)
{
    if (table == NULL || count == 0 || radiance == NULL || temperature_k == NULL ||
        element_status == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    for (size_t i = 0; i < count; ++i) {
        double value = 0.0;
        element_status[i] = lookup_temperature(table, radiance[i], &value);
        temperature_k[i] = value;
    }
    return GB_OK;
}
