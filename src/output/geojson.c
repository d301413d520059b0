/* geojson.c - the landing-map document: a GeoJSON FeatureCollection built
 * with Jansson, coordinates [longitude, latitude] on WGS 84 from the local
 * east/north metres through the geodesic routines (physics/geodesy.c). */
#include "output/geojson.h"

#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "base/version.h"
#include "output/report.h"

#define PI 3.14159265358979323846

struct sr_geojson {
    sr_geo origin;
    sr_unit_system sys;
    double pole;            /* distance to the nearer pole, m */
    json_t *root, *features;
    json_t *props;          /* of the latest feature (borrowed) */
    double bbox[4];         /* lon min, lat min, lon max, lat max */
    int nbox;
    int crosses, pole_hit;  /* a geometry the writer cannot place */
};

sr_geojson *sr_geojson_new(const sr_geo *origin, sr_unit_system sys)
{
    sr_geojson *g = calloc(1, sizeof *g);
    if (!g)
        return NULL;
    g->origin = *origin;
    g->sys = sys;
    g->pole = sr_geo_pole_distance(origin);
    g->root = json_object();
    g->features = json_array();
    if (!g->root || !g->features) {
        sr_geojson_free(g);
        return NULL;
    }
    char gen[64];
    snprintf(gen, sizeof gen, "sinkrate %s", SR_VERSION);
    json_object_set_new(g->root, "type", json_string("FeatureCollection"));
    json_object_set_new(g->root, "generator", json_string(gen));
    json_object_set_new(g->root, "caution", json_string(sr_report_caution()));
    json_object_set_new(g->root, "units", json_string(sys == SR_UNITS_US ? "us" : "si"));
    json_object_set_new(g->root, "datum", json_string("WGS 84 (RFC 7946); east and north are metres from the "
                                                      "launch point along the geodesic at their bearing"));
    return g;
}

void sr_geojson_free(sr_geojson *g)
{
    if (!g)
        return;
    json_decref(g->root);
    json_decref(g->features);
    free(g);
}

int sr_geojson_member(sr_geojson *g, const char *key, const char *text)
{
    return json_object_set_new(g->root, key, json_string(text ? text : "")) ? SR_ENOMEM : SR_OK;
}

/* [lon, lat] of a local point, widening the bbox and noting what cannot be drawn. */
static json_t *position(sr_geojson *g, double east, double north)
{
    double lat, lon;
    sr_geo_forward(&g->origin, east, north, &lat, &lon);
    if (lon < -180.0 || lon > 180.0)
        g->crosses = 1;
    if (hypot(east, north) >= g->pole)
        g->pole_hit = 1;
    if (!g->nbox++) {
        g->bbox[0] = g->bbox[2] = lon;
        g->bbox[1] = g->bbox[3] = lat;
    } else {
        g->bbox[0] = fmin(g->bbox[0], lon);
        g->bbox[1] = fmin(g->bbox[1], lat);
        g->bbox[2] = fmax(g->bbox[2], lon);
        g->bbox[3] = fmax(g->bbox[3], lat);
    }
    return json_pack("[f,f]", lon, lat);
}

static int feature(sr_geojson *g, const char *kind, const char *name, const char *type, json_t *coords)
{
    if (!coords)
        return SR_ENOMEM;
    json_t *f = json_object(), *geom = json_object(), *props = json_object();
    if (!f || !geom || !props) {
        json_decref(f);
        json_decref(geom);
        json_decref(props);
        json_decref(coords);
        return SR_ENOMEM;
    }
    json_object_set_new(geom, "type", json_string(type));
    json_object_set_new(geom, "coordinates", coords);
    json_object_set_new(props, "kind", json_string(kind));
    json_object_set_new(props, "name", json_string(name ? name : ""));
    json_object_set_new(f, "type", json_string("Feature"));
    json_object_set_new(f, "geometry", geom);
    json_object_set_new(f, "properties", props);
    g->props = props;
    return json_array_append_new(g->features, f) ? SR_ENOMEM : SR_OK;
}

int sr_geojson_point(sr_geojson *g, const char *kind, const char *name, double east, double north)
{
    return feature(g, kind, name, "Point", position(g, east, north));
}

int sr_geojson_line(sr_geojson *g, const char *kind, const char *name, const double *east, const double *north,
                    size_t n)
{
    if (n < 2)
        return SR_OK;
    json_t *c = json_array();
    for (size_t i = 0; c && i < n; i++)
        if (json_array_append_new(c, position(g, east[i], north[i]))) {
            json_decref(c);
            return SR_ENOMEM;
        }
    return feature(g, kind, name, "LineString", c);
}

int sr_geojson_ellipse(sr_geojson *g, const char *kind, const char *name, double east, double north, double major,
                       double minor, double bearing)
{
    /* the major axis u = (sin b, cos b) in (east, north) and w, u turned a
     * quarter counterclockwise: the ring runs counterclockwise as RFC 7946
     * asks of an exterior ring (the map keeps orientation: longitude grows
     * east, latitude north) */
    double ue = sin(bearing), un = cos(bearing), we = -un, wn = ue;
    json_t *ring = json_array(), *poly = json_array();
    if (!ring || !poly) {
        json_decref(ring);
        json_decref(poly);
        return SR_ENOMEM;
    }
    for (int i = 0; i <= SR_GEOJSON_RING; i++) {
        double t = 2.0 * PI * (i % SR_GEOJSON_RING) / SR_GEOJSON_RING, a = major * cos(t), b = minor * sin(t);
        if (json_array_append_new(ring, position(g, east + a * ue + b * we, north + a * un + b * wn))) {
            json_decref(ring);
            json_decref(poly);
            return SR_ENOMEM;
        }
    }
    json_array_append_new(poly, ring);
    return feature(g, kind, name, "Polygon", poly);
}

int sr_geojson_circle(sr_geojson *g, const char *kind, const char *name, double east, double north, double radius)
{
    return sr_geojson_ellipse(g, kind, name, east, north, radius, radius, 0.0);
}

static int prop(sr_geojson *g, const char *key, json_t *v)
{
    if (!g->props || !v) {
        json_decref(v);
        return g->props ? SR_ENOMEM : SR_EINVAL;
    }
    return json_object_set_new(g->props, key, v) ? SR_ENOMEM : SR_OK;
}

int sr_geojson_value(sr_geojson *g, const char *key, double si, sr_quantity q)
{
    char uk[128];
    snprintf(uk, sizeof uk, "%s_unit", key);
    int rc = prop(g, key, isfinite(si) ? json_real(sr_units_from_si(si, q, g->sys)) : json_null());
    const char *u = sr_units_label(q, g->sys);
    return rc ? rc : u[0] ? prop(g, uk, json_string(u)) : SR_OK;
}

int sr_geojson_text(sr_geojson *g, const char *key, const char *text)
{
    return prop(g, key, json_string(text ? text : ""));
}

int sr_geojson_integer(sr_geojson *g, const char *key, long long v)
{
    return prop(g, key, json_integer((json_int_t)v));
}

int sr_geojson_bearing(sr_geojson *g, const char *key, double rad)
{
    char uk[128];
    snprintf(uk, sizeof uk, "%s_unit", key);
    int rc = prop(g, key, isfinite(rad) ? json_real(sr_units_bearing_deg(rad, 9)) : json_null());
    return rc ? rc : prop(g, uk, json_string("deg"));
}

int sr_geojson_dump(const sr_geojson *g, char **buf, size_t *len, sr_error *err)
{
    if (g->crosses)
        return sr_error_set(err, SR_EIMPOSSIBLE, "the map crosses the antimeridian (longitude 180 deg), which this "
                                                 "GeoJSON writer does not split (RFC 7946, section 3.1.9)");
    if (g->pole_hit)
        return sr_error_set(err, SR_EIMPOSSIBLE, "the map reaches a pole, where latitude and longitude outlines "
                                                 "are not drawn");
    json_t *doc = json_deep_copy(g->root);
    if (!doc)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    if (g->nbox)
        json_object_set_new(doc, "bbox", json_pack("[f,f,f,f]", g->bbox[0], g->bbox[1], g->bbox[2], g->bbox[3]));
    json_object_set(doc, "features", g->features);
    char *s = json_dumps(doc, JSON_COMPACT | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(10));
    json_decref(doc);
    if (!s)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    size_t l = strlen(s);
    *buf = malloc(l + 2);
    if (!*buf) {
        free(s);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    memcpy(*buf, s, l);
    (*buf)[l] = '\n';
    (*buf)[l + 1] = '\0';
    *len = l + 1;
    free(s);
    return SR_OK;
}
