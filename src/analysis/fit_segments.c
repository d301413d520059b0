/* fit_segments.c - the segments of a flight log: a median filter against
 * spikes and dropouts, the smoothed descent rate, apogee, touchdown and the
 * deployments as change points of the descent rate reduced to ground
 * density (a steady stage then has a constant rate). */
#include "analysis/fit_int.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_filter.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <gsl/gsl_vector.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* Window lengths, our choice: the median filter must outlast an ejection
 * spike or a dropout (common practice: a few tenths of a second), the rate
 * window averages the altimeter noise, the change-point windows must see a
 * rate change that lasts. */
#define MEDIAN_S 1.5
#define RATE_HALF_S 1.0
#define CHANGE_S 3.0
#define BEFORE_S 2.0
#define AFTER_S 4.0
#define CHANGE_RATIO 1.5    /* rate before over rate after: a canopy opening */
#define CHANGE_SIG 5.0      /* the drop in robust standard deviations of the smoothed rate */
#define CHANGE_MIN 1.0      /* m/s: the smallest drop taken for a deployment */
#define CHANGE_GAP_S 8.0    /* two deployments at least this far apart */

size_t sr_fit_odd_window(double seconds, double step, size_t n, size_t min)
{
    size_t k = (size_t)lround(seconds / step);
    if (k < min)
        k = min;
    if (k % 2 == 0)
        k++;
    while (k > n)
        k -= 2;
    return k < 1 ? 1 : k;
}

int sr_fit_median(const double *x, double *y, size_t n, size_t k, sr_error *err)
{
    if (k <= 1) {
        memcpy(y, x, n * sizeof *y);
        return SR_OK;
    }
    gsl_filter_median_workspace *w = gsl_filter_median_alloc(k);
    if (!w)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    gsl_vector_const_view xv = gsl_vector_const_view_array(x, n);
    gsl_vector_view yv = gsl_vector_view_array(y, n);
    int rc = gsl_filter_median(GSL_FILTER_END_TRUNCATE, &xv.vector, &yv.vector, w);
    gsl_filter_median_free(w);
    return rc ? sr_error_set(err, SR_ENUMERIC, "median filter: %s", gsl_strerror(rc)) : SR_OK;
}

int sr_fit_smooth(const double *t, const double *z, size_t n, double step, double *smooth, double *rate,
               double *noise, sr_error *err)
{
    int rc = sr_fit_median(z, smooth, n, sr_fit_odd_window(MEDIAN_S, step, n, 5), err);
    if (rc)
        return rc;
    double *d = malloc(n * sizeof *d);
    if (!d)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    for (size_t i = 0; i < n; i++)
        d[i] = fabs(z[i] - smooth[i]);
    gsl_sort(d, 1, n);
    /* 1.4826 MAD: the standard deviation of normal noise, robust to the spikes */
    *noise = 1.4826 * gsl_stats_median_from_sorted_data(d, 1, n);
    free(d);
    /* local least-squares slope over +-RATE_HALF_S; hand-written with running
     * sums because GSL's moving-window module has no regression */
    size_t lo = 0, hi = 0;
    double s1 = 0, st = 0, sz = 0, stt = 0, stz = 0;
    for (size_t i = 0; i < n; i++) {
        double tc = t[i];
        while (hi < n && t[hi] <= tc + RATE_HALF_S + 1e-9) {
            double u = t[hi] - t[0];
            s1 += 1;
            st += u;
            sz += smooth[hi];
            stt += u * u;
            stz += u * smooth[hi];
            hi++;
        }
        while (lo < hi && t[lo] < tc - RATE_HALF_S - 1e-9) {
            double u = t[lo] - t[0];
            s1 -= 1;
            st -= u;
            sz -= smooth[lo];
            stt -= u * u;
            stz -= u * smooth[lo];
            lo++;
        }
        double den = s1 * stt - st * st;
        if (s1 >= 3 && den > 1e-12 * s1 * s1)
            rate[i] = -(s1 * stz - st * sz) / den;
        else
            rate[i] = i > 0 ? rate[i - 1] : 0.0;
    }
    return SR_OK;
}

typedef struct cand {
    size_t i;
    double score;
} cand;

static int by_score(const void *a, const void *b)
{
    double x = ((const cand *)a)->score, y = ((const cand *)b)->score;
    return (x < y) - (x > y);
}

static int by_row(const void *a, const void *b)
{
    size_t x = *(const size_t *)a, y = *(const size_t *)b;
    return (x > y) - (x < y);
}

int sr_fit_segments(const sr_flightlog *log, const double *t, const double *smooth, const double *rate, size_t n,
                 const fit_air *air, double zground, double noise, fit_seg *seg, sr_error *err)
{
    memset(seg, 0, sizeof *seg);
    size_t ap = 0;
    for (size_t i = 1; i < n; i++)
        if (smooth[i] > smooth[ap])
            ap = i;
    seg->apogee = ap;
    double zmin = smooth[ap];
    for (size_t i = ap; i < n; i++)
        zmin = fmin(zmin, smooth[i]);
    char w[600];
    if (smooth[ap] - zmin < fmax(20.0, 10.0 * noise) || ap + SR_FLIGHTLOG_MIN_ROWS > n) {
        sr_flightlog_where(log, ap, log->field_v, w, sizeof w);
        return sr_error_set(err, SR_EINVAL,
                            "%s: the log never descends: after its highest point (%.1f s) it falls %.1f m, less than "
                            "%.0f m, in %zu rows",
                            w, t[ap], smooth[ap] - zmin, fmax(20.0, 10.0 * noise), n - ap - 1);
    }
    /* touchdown: the first row near the lowest point after apogee; when that
     * comes within a second of the end, the log ends in flight */
    seg->touch = n - 1;
    double lim = zmin + fmax(1.5, 4.0 * noise);
    for (size_t i = ap + 1; i < n; i++)
        if (smooth[i] <= lim) {
            seg->touch = i;
            break;
        }
    seg->touchdown = t[n - 1] - t[seg->touch] >= 1.0;
    if (!seg->touchdown)
        seg->touch = n - 1;
    /* change points of the reduced rate between apogee and touchdown */
    size_t m = seg->touch - ap + 1;
    double *u = malloc(m * sizeof *u), *M = malloc(m * sizeof *M);
    cand *c = malloc(m * sizeof *c);
    if (!u || !M || !c) {
        free(u);
        free(M);
        free(c);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    double kg = sr_fit_air_k1(air, zground);
    for (size_t j = 0; j < m; j++)
        u[j] = rate[ap + j] * kg / sr_fit_air_k1(air, smooth[ap + j]);
    int rc = sr_fit_median(u, M, m, sr_fit_odd_window(CHANGE_S, log->step, m, 3), err);
    /* the scatter of the smoothed rate about its moving median, robust */
    double unoise = 0.0;
    if (!rc) {
        double *tmp = malloc(m * sizeof *tmp);
        if (!tmp)
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        for (size_t j = 0; tmp && j < m; j++)
            tmp[j] = fabs(u[j] - M[j]);
        if (tmp) {
            gsl_sort(tmp, 1, m);
            unoise = 1.4826 * gsl_stats_median_from_sorted_data(tmp, 1, m);
        }
        free(tmp);
    }
    size_t nc = 0;
    for (size_t j = 0; !rc && j < m; j++) {
        double tj = t[ap + j];
        /* the later window must end before the touchdown reaches into the smoothed rate */
        if (tj < t[ap] + BEFORE_S + 1.0 || tj > t[seg->touch] - AFTER_S - 0.5 * CHANGE_S - RATE_HALF_S - 0.5)
            continue;
        /* the rows BEFORE_S earlier and AFTER_S later */
        size_t jb = j, ja = j;
        while (jb > 0 && t[ap + jb] > tj - BEFORE_S)
            jb--;
        while (ja + 1 < m && t[ap + ja] < tj + AFTER_S)
            ja++;
        double before = M[jb], after = M[ja];
        if (before - after < fmax(CHANGE_MIN, CHANGE_SIG * unoise) || !(after > 0.1) || before / after < CHANGE_RATIO)
            continue;
        c[nc].i = j;
        c[nc].score = before / after;
        nc++;
    }
    qsort(c, nc, sizeof *c, by_score);
    for (size_t k = 0; k < nc && seg->ndep < sizeof seg->dep / sizeof seg->dep[0]; k++) {
        double tk = t[ap + c[k].i];
        int near = 0;
        for (size_t q = 0; q < seg->ndep; q++)
            if (fabs(t[seg->dep[q]] - tk) < CHANGE_GAP_S)
                near = 1;
        if (near)
            continue;
        /* the drop starts where the reduced rate first falls a tenth of the way down */
        size_t j = c[k].i, jb = j, ja = j;
        while (jb > 0 && t[ap + jb] > tk - BEFORE_S)
            jb--;
        while (ja + 1 < m && t[ap + ja] < tk + AFTER_S)
            ja++;
        double thr = M[jb] - 0.1 * (M[jb] - M[ja]);
        size_t d = jb;
        while (d < ja && u[d] >= thr)
            d++;
        seg->dep[seg->ndep++] = ap + d;
    }
    qsort(seg->dep, seg->ndep, sizeof seg->dep[0], by_row);
    free(u);
    free(M);
    free(c);
    return rc;
}
