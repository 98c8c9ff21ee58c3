/*
 * spectral.h — the spectral position of a request (exactly one of
 * `wavelength` [um, nm or m by `wavelength_unit`], `wavenumber` [cm^-1] or
 * `frequency` [THz]) and the unit of spectral densities that follows from it
 * (per um, nm, m, cm^-1 or Hz).  Shared by the radiance and
 * brightness-temperature handlers.
 */
#ifndef GREYBODY_SPECTRAL_H
#define GREYBODY_SPECTRAL_H

#include "params.h"
#include "planck.h"
#include "units.h"

typedef struct gb_spectral {
    gb_spectral_coordinate coordinate;
    const char *field;                  /* "wavelength", "wavenumber" or "frequency" */
    gb_wavelength_unit wavelength_unit; /* for GB_WAVELENGTH */
    const char *per;                    /* density suffix: "um-1", "nm-1", "m-1", "(cm-1)-1", "Hz-1" */
} gb_spectral;

/* Reads the position (GB_ARRAY_OK) and its unit; wavelength_unit with another coordinate is a conflict. */
bool gb_spectral_read(gb_params *params, gb_spectral *spectral, gb_num *position);

/* The request's position value -> the core's (um, cm^-1 or Hz). */
gb_status gb_spectral_to_core(const gb_spectral *spectral, double value, double *position);

/* A spectral density from the core's unit (per um, cm^-1, Hz) to the request's, and back. */
double gb_spectral_density_out(const gb_spectral *spectral, double core_density);
double gb_spectral_density_in(const gb_spectral *spectral, double request_density);

#endif
