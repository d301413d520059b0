/* geodesy.c - local east/north to WGS 84 latitude and longitude by PROJ's
 * geodesic direct and inverse problems (docs/method.md, Landing maps). */
#include "physics/geodesy.h"

#include <dlfcn.h>
#include <math.h>
#include <string.h>

#ifndef SR_PROJ_SONAME
#define SR_PROJ_SONAME "libproj.so"
#endif

#define PI 3.14159265358979323846

int sr_geo_init(sr_geo *o, double lat_deg, double lon_deg, sr_error *err)
{
    if (!isfinite(lat_deg) || lat_deg < -90.0 || lat_deg > 90.0)
        return sr_error_set(err, SR_EINVAL, "latitude %g deg is outside -90 .. 90 deg", lat_deg);
    if (!isfinite(lon_deg) || lon_deg < -180.0 || lon_deg > 180.0)
        return sr_error_set(err, SR_EINVAL, "longitude %g deg is outside -180 .. 180 deg", lon_deg);
    /* the handle is never closed: dlopen counts its users, and the process keeps one copy */
    void *lib = dlopen(SR_PROJ_SONAME, RTLD_NOW | RTLD_LOCAL);
    if (!lib && strcmp(SR_PROJ_SONAME, "libproj.so") != 0)
        lib = dlopen("libproj.so", RTLD_NOW | RTLD_LOCAL);
    if (!lib)
        return sr_error_set(err, SR_EIO, "PROJ's geodesic routines (%s) cannot be loaded for the map: %s; install "
                                         "the PROJ library (Debian: libproj-dev or libproj25)",
                            SR_PROJ_SONAME, dlerror());
    void (*init)(struct geod_geodesic *, double, double);
    /* POSIX converts dlsym's object pointer to a function pointer this way */
    *(void **)&init = dlsym(lib, "geod_init");
    *(void **)&o->gendirect = dlsym(lib, "geod_gendirect");
    *(void **)&o->inverse = dlsym(lib, "geod_inverse");
    if (!init || !o->gendirect || !o->inverse)
        return sr_error_set(err, SR_EIO, "%s has no geodesic routines (geod_init, geod_gendirect, geod_inverse)",
                            SR_PROJ_SONAME);
    init(&o->g, SR_WGS84_A, SR_WGS84_F);
    o->lat0 = lat_deg;
    o->lon0 = lon_deg;
    return SR_OK;
}

void sr_geo_forward(const sr_geo *o, double east, double north, double *lat, double *lon)
{
    double s = hypot(east, north);
    if (s == 0.0) {
        *lat = o->lat0;
        *lon = o->lon0;
        return;
    }
    double azi = atan2(east, north) * 180.0 / PI;
    o->gendirect(&o->g, o->lat0, o->lon0, azi, GEOD_LONG_UNROLL, s, lat, lon, NULL, NULL, NULL, NULL, NULL,
                   NULL);
}

void sr_geo_inverse(const sr_geo *o, double lat, double lon, double *east, double *north)
{
    double s, azi;
    o->inverse(&o->g, o->lat0, o->lon0, lat, lon, &s, &azi, NULL);
    double a = azi * PI / 180.0;
    *east = s * sin(a);
    *north = s * cos(a);
}

double sr_geo_pole_distance(const sr_geo *o)
{
    double s;
    o->inverse(&o->g, o->lat0, o->lon0, o->lat0 >= 0.0 ? 90.0 : -90.0, o->lon0, &s, NULL, NULL);
    return s;
}
