#include "bandtable.h"

#include <math.h>

#define EDGE_SLACK 1e-9

/* Cubic Hermite interpolation on a uniform grid: value and slope at nodes, position in steps. */
static double hermite(const double *value, const double *slope, size_t nodes, double step,
                      double position)
{
    size_t node = (size_t)position;
    double t, t2, t3;
    if (node >= nodes - 1) {
        node = nodes - 2;
    }
    t = position - (double)node;
    t2 = t * t;
    t3 = t2 * t;
    return (2.0 * t3 - 3.0 * t2 + 1.0) * value[node] + (t3 - 2.0 * t2 + t) * step * slope[node] +
           (-2.0 * t3 + 3.0 * t2) * value[node + 1] + (t3 - t2) * step * slope[node + 1];
}

gb_status gb_band_table_build(const gb_band *band, double t_min, double t_max,
                              gb_band_table *table)
{
    double forward_last = (double)(GB_BAND_TABLE_FORWARD_NODES - 1);
    double inverse_last = (double)(GB_BAND_TABLE_INVERSE_NODES - 1);
    double y_max, radiance, derivative;
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
        table->forward_value[i] = log(radiance);
        /* dy/du = (dL/dT / L) dT/du = -(dL/dT / L) T^2 */
        table->forward_slope[i] = -temperature * temperature * derivative / radiance;
    }
    table->y_min = table->forward_value[GB_BAND_TABLE_FORWARD_NODES - 1];
    y_max = table->forward_value[0];
    table->y_step = (y_max - table->y_min) / inverse_last;
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
        table->inverse_value[i] = temperature;
        table->inverse_slope[i] = radiance / derivative; /* dT/dy = L / (dL/dT) */
    }
    return GB_OK;
}

gb_status gb_band_table_radiance(const gb_band_table *table, double temperature_k,
                                 double *radiance)
{
    double position;
    if (table == NULL || radiance == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!(temperature_k >= table->t_min && temperature_k <= table->t_max)) {
        return isnan(temperature_k) ? GB_ERR_NOT_FINITE : GB_ERR_TEMPERATURE_DOMAIN;
    }
    position = (1.0 / temperature_k - table->u_min) / table->u_step;
    position = fmin(fmax(position, 0.0), (double)(GB_BAND_TABLE_FORWARD_NODES - 1));
    *radiance = exp(hermite(table->forward_value, table->forward_slope,
                            GB_BAND_TABLE_FORWARD_NODES, table->u_step, position));
    return GB_OK;
}

gb_status gb_band_table_temperature(const gb_band_table *table, double radiance,
                                    double *temperature_k)
{
    double y, position;
    if (table == NULL || temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!(radiance > 0.0)) {
        return isnan(radiance) ? GB_ERR_NOT_FINITE : GB_ERR_RADIANCE_DOMAIN;
    }
    y = log(radiance);
    position = (y - table->y_min) / table->y_step;
    /* The end radiances themselves may land a rounding outside the grid. */
    if (!(position >= -EDGE_SLACK &&
          position <= (double)(GB_BAND_TABLE_INVERSE_NODES - 1) + EDGE_SLACK)) {
        return isfinite(y) ? GB_ERR_RADIANCE_OUT_OF_RANGE : GB_ERR_NOT_FINITE;
    }
    position = fmin(fmax(position, 0.0), (double)(GB_BAND_TABLE_INVERSE_NODES - 1));
    *temperature_k = hermite(table->inverse_value, table->inverse_slope,
                             GB_BAND_TABLE_INVERSE_NODES, table->y_step, position);
    return GB_OK;
}
