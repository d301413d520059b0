/* geodesy.c - local east/north to WGS 84 latitude and longitude by PROJ's
 * geodesic direct and inverse problems (docs/method.md, Landing maps). */
#include "physics/geodesy.h"

#include <math.h>

#define PI 3.14159265358979323846

int sr_geo_init(sr_geo *o, double lat_deg, double lon_deg, sr_error *err)
{
    if (!isfinite(lat_deg) || lat_deg < -90.0 || lat_deg > 90.0)
        return sr_error_set(err, SR_EINVAL, "latitude %g deg is outside -90 .. 90 deg", lat_deg);
    if (!isfinite(lon_deg) || lon_deg < -180.0 || lon_deg > 180.0)
        return sr_error_set(err, SR_EINVAL, "longitude %g deg is outside -180 .. 180 deg", lon_deg);
    geod_init(&o->g, SR_WGS84_A, SR_WGS84_F);
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
    geod_gendirect(&o->g, o->lat0, o->lon0, azi, GEOD_LONG_UNROLL, s, lat, lon, NULL, NULL, NULL, NULL, NULL,
                   NULL);
}

void sr_geo_inverse(const sr_geo *o, double lat, double lon, double *east, double *north)
{
    double s, azi;
    geod_inverse(&o->g, o->lat0, o->lon0, lat, lon, &s, &azi, NULL);
    double a = azi * PI / 180.0;
    *east = s * sin(a);
    *north = s * cos(a);
}

double sr_geo_pole_distance(const sr_geo *o)
{
    double s;
    geod_inverse(&o->g, o->lat0, o->lon0, o->lat0 >= 0.0 ? 90.0 : -90.0, o->lon0, &s, NULL, NULL);
    return s;
}
