/* geodesy.h - local east/north distances from a launch point on the WGS 84
 * ellipsoid, through PROJ's geodesic routines (Karney's algorithms, from
 * Debian's libproj): the point a distance and azimuth away, and back.
 * libproj is opened when the first point is made (sr_geo_init), not linked:
 * its dependencies (network and image libraries) cost about 20 ms at every
 * start of every command, and only the landing maps need it. */
#ifndef SR_GEODESY_H
#define SR_GEODESY_H

#include <geodesic.h>

#include "base/error.h"

/* A launch or release point: its WGS 84 latitude and longitude (degrees,
 * north and east positive) and the ellipsoid. */
typedef struct sr_geo {
    struct geod_geodesic g;
    double lat0, lon0;
    /* PROJ's routines, from the library opened by sr_geo_init */
    double (*gendirect)(const struct geod_geodesic *, double, double, double, unsigned, double, double *, double *,
                        double *, double *, double *, double *, double *, double *);
    void (*inverse)(const struct geod_geodesic *, double, double, double, double, double *, double *, double *);
} sr_geo;

/* WGS 84 (NIMA TR8350.2): equatorial radius and flattening. */
#define SR_WGS84_A 6378137.0
#define SR_WGS84_F (1.0 / 298.257223563)

/* Latitude within -90 .. 90 deg, longitude within -180 .. 180 deg. Opens
 * libproj (its soname found at build time, SR_PROJ_SONAME; the loader keeps
 * one copy for the process): SR_EIO with one line when it cannot. */
int sr_geo_init(sr_geo *o, double lat_deg, double lon_deg, sr_error *err);

/* The point east, north metres from the launch point, read as the geodesic
 * of length hypot(east, north) leaving it at the azimuth atan2(east, north)
 * (an azimuthal equidistant map centred on the launch point: distance and
 * bearing from it are kept exactly). *lon is unrolled: continuous from
 * lon0, so it may leave -180 .. 180 near the antimeridian. */
void sr_geo_forward(const sr_geo *o, double east, double north, double *lat, double *lon);

/* The inverse: distance and azimuth from the launch point to (lat, lon),
 * as east and north metres. */
void sr_geo_inverse(const sr_geo *o, double lat, double lon, double *east, double *north);

/* Distance from the launch point to the nearer pole along its meridian, m. */
double sr_geo_pole_distance(const sr_geo *o);

#endif
