/*
 * planck_check.c — a program an integrator might write, built by
 * tests/install/test_install.py against an installed greybody with nothing
 * but `pkg-config --cflags --libs greybody`.  It prints what the installed
 * library computes, one "name value" line each; the test compares them with
 * published values.
 */
#include <greybody/planck.h>
#include <greybody/status.h>
#include <stdio.h>

int main(void)
{
    double radiance = 0.0;
    gb_status status = gb_planck_radiance(GB_WAVELENGTH, 10.0, 300.0, 1.0, &radiance);
    printf("radiance_10um_300K %s %.17g\n", gb_status_name(status), radiance);

    double temperature = 0.0;
    status = gb_brightness_temperature(GB_WAVELENGTH, 11.0, 10.0, 1.0, &temperature);
    printf("brightness_11um_10 %s %.17g\n", gb_status_name(status), temperature);

    double exitance = 0.0;
    status = gb_total_exitance(300.0, 1.0, &exitance);
    printf("exitance_300K %s %.17g\n", gb_status_name(status), exitance);

    status = gb_planck_radiance(GB_WAVELENGTH, 10.0, -5.0, 1.0, &radiance);
    printf("radiance_minus_5K %s\n", gb_status_name(status));
    return 0;
}
