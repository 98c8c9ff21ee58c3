#include "spectral.h"

#include <math.h>

static const char *const positions[] = {"wavelength", "wavenumber", "frequency", NULL};

#define HZ_PER_THZ 1e12
#define NM_PER_UM 1000.0
#define UM_PER_M 1e6

bool gb_spectral_read(gb_params *params, gb_spectral *spectral, gb_num *position)
{
    size_t which = 0;
    bool unit_given = false;
    spectral->coordinate = GB_WAVELENGTH;
    spectral->field = positions[0];
    spectral->wavelength_unit = GB_MICROMETRE;
    spectral->per = "um-1";
    if (!gb_params_one_of(params, positions, true, &which) ||
        !gb_params_wavelength_unit(params, &spectral->wavelength_unit, &unit_given)) {
        return false;
    }
    spectral->field = positions[which];
    if (which == 0) {
        spectral->coordinate = GB_WAVELENGTH;
        spectral->per = spectral->wavelength_unit == GB_NANOMETRE ? "nm-1"
                        : spectral->wavelength_unit == GB_METRE   ? "m-1"
                                                                  : "um-1";
    } else {
        if (unit_given) {
            return gb_params_fail(params, GB_PROBLEM_CONFLICTING_FIELDS, "wavelength_unit",
                                  "\"wavelength_unit\" applies only to \"wavelength\", not to "
                                  "\"%s\".",
                                  positions[which]);
        }
        spectral->coordinate = which == 1 ? GB_WAVENUMBER : GB_FREQUENCY;
        spectral->per = which == 1 ? "(cm-1)-1" : "Hz-1";
    }
    return gb_params_number(params, spectral->field, GB_REQUIRED | GB_ARRAY_OK, 0.0, position);
}

gb_status gb_spectral_to_core(const gb_spectral *spectral, double value, double *position)
{
    switch (spectral->coordinate) {
    case GB_WAVELENGTH:
        return gb_wavelength_to_micrometres(value, spectral->wavelength_unit, position);
    case GB_FREQUENCY:
        if (!(value > 0.0)) {
            return GB_ERR_SPECTRAL_DOMAIN;
        }
        *position = value * HZ_PER_THZ;
        return isfinite(*position) ? GB_OK : GB_ERR_SPECTRAL_DOMAIN;
    case GB_WAVENUMBER:
        break;
    }
    if (!(value > 0.0)) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    *position = value;
    return GB_OK;
}

double gb_spectral_density_out(const gb_spectral *spectral, double core_density)
{
    if (spectral->coordinate != GB_WAVELENGTH) {
        return core_density;
    }
    switch (spectral->wavelength_unit) {
    case GB_NANOMETRE: return core_density / NM_PER_UM;
    case GB_METRE: return core_density * UM_PER_M;
    case GB_MICROMETRE: break;
    }
    return core_density;
}

double gb_spectral_density_in(const gb_spectral *spectral, double request_density)
{
    if (spectral->coordinate != GB_WAVELENGTH) {
        return request_density;
    }
    switch (spectral->wavelength_unit) {
    case GB_NANOMETRE: return request_density * NM_PER_UM;
    case GB_METRE: return request_density / UM_PER_M;
    case GB_MICROMETRE: break;
    }
    return request_density;
}
