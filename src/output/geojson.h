/* geojson.h - landing maps as GeoJSON (RFC 7946), written with Jansson:
 * points, tracks (LineString) and outlines (Polygon, counterclockwise) given
 * in metres east and north of the launch point, placed on WGS 84 through
 * physics/geodesy.h; every feature's properties carry its values with their
 * units, and the collection carries the caution. */
#ifndef SR_GEOJSON_H
#define SR_GEOJSON_H

#include <stddef.h>

#include "base/error.h"
#include "physics/geodesy.h"
#include "physics/units.h"

typedef struct sr_geojson sr_geojson;

/* Vertices of a closed outline (ellipse, circle), the first repeated at the end. */
#define SR_GEOJSON_RING 72

/* An empty collection around the launch point; values in the unit system
 * sys. NULL when out of memory. */
sr_geojson *sr_geojson_new(const sr_geo *origin, sr_unit_system sys);
void sr_geojson_free(sr_geojson *g);

/* A text member of the collection itself (a foreign member, RFC 7946
 * section 6.1): "title", "mission". The caution and the generator are set
 * by sr_geojson_new. */
int sr_geojson_member(sr_geojson *g, const char *key, const char *text);

/* A new feature; the properties that follow belong to it. kind says what
 * it is ("landing point", "1-sigma ellipse"), name which one. */
int sr_geojson_point(sr_geojson *g, const char *kind, const char *name, double east, double north);
/* A track through n >= 2 points (fewer: nothing is added, and 0 returned). */
int sr_geojson_line(sr_geojson *g, const char *kind, const char *name, const double *east, const double *north,
                    size_t n);
/* An ellipse with semi-axes major and minor (m), the major axis at bearing
 * (rad clockwise from north), centred at (east, north). */
int sr_geojson_ellipse(sr_geojson *g, const char *kind, const char *name, double east, double north, double major,
                       double minor, double bearing);
int sr_geojson_circle(sr_geojson *g, const char *kind, const char *name, double east, double north, double radius);

/* Properties of the latest feature: an SI value shown in the unit system as
 * key = number and key_unit = its unit (NaN: null); a plain text; a bearing
 * (rad) in degrees 0 .. 360. */
int sr_geojson_value(sr_geojson *g, const char *key, double si, sr_quantity q);
int sr_geojson_text(sr_geojson *g, const char *key, const char *text);
int sr_geojson_integer(sr_geojson *g, const char *key, long long v);
int sr_geojson_bearing(sr_geojson *g, const char *key, double rad);

/* The document (with its bbox), malloc'd. Fails, naming why, when a
 * geometry crosses the antimeridian or reaches a pole, which this writer
 * does not split (RFC 7946 section 3.1.9). */
int sr_geojson_dump(const sr_geojson *g, char **buf, size_t *len, sr_error *err);

#endif
