/* scatter.c - landing-scatter statistics with GSL (eigen-decomposition,
 * means, covariance, sorted-data quantiles). */
#include "analysis/scatter.h"

#include <gsl/gsl_eigen.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#define PI 3.14159265358979323846

const double sr_scatter_pct[SR_SCATTER_NPCT] = {0.01, 0.05, 0.50, 0.95, 0.99};

int sr_scatter_ellipse(double cov_ee, double cov_en, double cov_nn, double k, sr_ellipse *e, sr_error *err)
{
    memset(e, 0, sizeof *e);
    if (!(isfinite(cov_ee) && isfinite(cov_en) && isfinite(cov_nn) && cov_ee >= 0.0 && cov_nn >= 0.0))
        return sr_error_set(err, SR_EINVAL, "scatter: the covariance is not a valid covariance matrix");
    double a[4] = {cov_ee, cov_en, cov_en, cov_nn};
    double val[2], vec[4];
    gsl_matrix_view A = gsl_matrix_view_array(a, 2, 2);
    gsl_vector_view V = gsl_vector_view_array(val, 2);
    gsl_matrix_view E = gsl_matrix_view_array(vec, 2, 2);
    gsl_eigen_symmv_workspace *w = gsl_eigen_symmv_alloc(2);
    if (!w)
        return sr_error_set(err, SR_ENOMEM, "scatter: no memory for the eigen-decomposition");
    int st = gsl_eigen_symmv(&A.matrix, &V.vector, &E.matrix, w);
    gsl_eigen_symmv_free(w);
    if (st)
        return sr_error_set(err, SR_ENUMERIC, "scatter: eigen-decomposition failed: %s", gsl_strerror(st));
    if ((st = gsl_eigen_symmv_sort(&V.vector, &E.matrix, GSL_EIGEN_SORT_VAL_DESC)))
        return sr_error_set(err, SR_ENUMERIC, "scatter: eigen-decomposition failed: %s", gsl_strerror(st));
    /* a collinear scatter leaves rounding noise (|l2| ~ 1e-16 l1, either sign)
     * for the minor axis: below 1e-12 l1 (axes in a ratio under 1e-6) it is zero */
    double l1 = val[0] > 0.0 ? val[0] : 0.0, l2 = val[1] > 1e-12 * l1 ? val[1] : 0.0;
    e->major = k * sqrt(l1);
    e->minor = k * sqrt(l2);
    /* the major axis is the first column (east, north); its bearing from north */
    double b = atan2(vec[0], vec[2]);
    if (b < 0.0)
        b += PI;
    if (b >= PI)
        b -= PI;
    e->bearing = b;
    return SR_OK;
}

void sr_scatter_proportion(size_t count, size_t n, double z, sr_proportion *out)
{
    memset(out, 0, sizeof *out);
    out->count = count;
    out->n = n;
    if (n == 0) {
        out->p = out->se = out->lo = out->hi = NAN;
        return;
    }
    double N = (double)n, p = (double)count / N;
    out->p = p;
    out->se = sqrt(p * (1.0 - p) / N);
    /* Wilson score interval (Wilson 1927, JASA 22:209) */
    double z2 = z * z, den = 1.0 + z2 / N, mid = (p + z2 / (2.0 * N)) / den;
    double half = z * sqrt(p * (1.0 - p) / N + z2 / (4.0 * N * N)) / den;
    out->lo = count == 0 ? 0.0 : mid - half;
    out->hi = count == n ? 1.0 : mid + half;
}

void sr_scatter_quantiles(double *x, size_t n, const double *probs, size_t np, double *out)
{
    /* The interpolated quantile of gsl_stats_quantile_from_sorted_data from
     * two order statistics found by selection (gsl_stats_select, O(n)): a
     * full sort (gsl_sort is a heapsort) took longer than the samples. */
    for (size_t k = 0; k < np; k++) {
        double h = (double)(n - 1) * probs[k];
        size_t lo = (size_t)h;
        if (lo >= n - 1) {
            out[k] = gsl_stats_max(x, 1, n);
            continue;
        }
        double d = h - (double)lo, a = gsl_stats_select(x, 1, n, lo);
        /* after the selection every element above index lo is >= a */
        double b = d > 0.0 ? gsl_stats_min(x + lo + 1, 1, n - lo - 1) : a;
        out[k] = d > 0.0 ? (1.0 - d) * a + d * b : a;
    }
}

static void spread1(double *tmp, size_t n, sr_spread1 *s)
{
    s->mean = gsl_stats_mean(tmp, 1, n);
    gsl_stats_minmax(&s->min, &s->max, tmp, 1, n);
    sr_scatter_quantiles(tmp, n, sr_scatter_pct, SR_SCATTER_NPCT, s->pct);
}

int sr_scatter_stats(const sr_disp_result *res, sr_disp_stats *st, sr_error *err)
{
    memset(st, 0, sizeof *st);
    const size_t n = res->n, nb = res->nbodies;
    if (n == 0 || nb == 0 || nb > SR_DISP_MAX_BODIES || !res->land)
        return sr_error_set(err, SR_EINVAL, "scatter: no samples");
    st->n = n;
    st->nbodies = nb;
    double *tmp = malloc(n * sizeof *tmp);
    if (!tmp)
        return sr_error_set(err, SR_ENOMEM, "scatter: no memory for %zu samples", n);
    /* the landing array seen as doubles: one field of body b every `stride` */
    const size_t stride = nb * (sizeof(sr_landing) / sizeof(double));
    _Static_assert(sizeof(sr_landing) == 5 * sizeof(double), "sr_landing is five packed doubles");
    for (size_t b = 0; b < nb; b++) {
        sr_body_stats *s = &st->body[b];
        const double *E = &res->land[b].east, *N = &res->land[b].north;
        s->mean_east = gsl_stats_mean(E, stride, n);
        s->mean_north = gsl_stats_mean(N, stride, n);
        s->mean_distance = hypot(s->mean_east, s->mean_north);
        double brg = atan2(s->mean_east, s->mean_north);
        s->mean_bearing = brg < 0.0 ? brg + 2.0 * PI : brg;
        if (n > 1) {
            s->cov_ee = gsl_stats_variance_m(E, stride, n, s->mean_east);
            s->cov_nn = gsl_stats_variance_m(N, stride, n, s->mean_north);
            s->cov_en = gsl_stats_covariance_m(E, stride, N, stride, n, s->mean_east, s->mean_north);
        }
        int rc;
        if ((rc = sr_scatter_ellipse(s->cov_ee, s->cov_en, s->cov_nn, 1.0, &s->sigma1, err)) ||
            (rc = sr_scatter_ellipse(s->cov_ee, s->cov_en, s->cov_nn, 3.0, &s->sigma3, err))) {
            free(tmp);
            return rc;
        }
        double q[2];
        const double p5095[2] = {0.50, 0.95};
        for (size_t i = 0; i < n; i++) {
            const sr_landing *L = &res->land[i * nb + b];
            tmp[i] = hypot(L->east - s->mean_east, L->north - s->mean_north);
        }
        sr_scatter_quantiles(tmp, n, p5095, 2, q);
        s->r50_mean = q[0];
        s->r95_mean = q[1];
        for (size_t i = 0; i < n; i++) {
            const sr_landing *L = &res->land[i * nb + b];
            tmp[i] = hypot(L->east, L->north);
        }
        sr_scatter_quantiles(tmp, n, p5095, 2, q);
        s->r50_launch = q[0];
        s->r95_launch = q[1];
        for (size_t i = 0; i < n; i++)
            tmp[i] = res->land[i * nb + b].time;
        spread1(tmp, n, &s->time);
        for (size_t i = 0; i < n; i++)
            tmp[i] = res->land[i * nb + b].speed;
        spread1(tmp, n, &s->speed);
        for (size_t i = 0; i < n; i++)
            tmp[i] = res->land[i * nb + b].energy;
        spread1(tmp, n, &s->energy);
    }
    free(tmp);
    size_t cnt[SR_DISP_NLIMITS] = {0}, any = 0;
    for (size_t i = 0; i < n; i++) {
        unsigned f = res->flags[i];
        for (int k = 0; k < SR_DISP_NLIMITS; k++)
            cnt[k] += (f >> k) & 1u;
        any += f != 0;
    }
    for (int k = 0; k < SR_DISP_NLIMITS; k++)
        sr_scatter_proportion(cnt[k], n, 1.959963984540054, &st->limit[k]);
    sr_scatter_proportion(any, n, 1.959963984540054, &st->any);
    return SR_OK;
}

/* ---- a program's scatter statistics (include/sinkrate/analysis.h) ---- */

int sr_disp_stats_new(sr_disp_stats **out, const sr_disp_result *r, sr_error *err)
{
    *out = NULL;
    sr_disp_stats *s = calloc(1, sizeof *s);
    if (!s)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_scatter_stats(r, s, err);
    if (rc) {
        free(s);
        return rc;
    }
    *out = s;
    return SR_OK;
}

void sr_disp_stats_free(sr_disp_stats *s)
{
    free(s);
}

const sr_body_stats *sr_disp_stats_body(const sr_disp_stats *s, size_t b)
{
    return b < s->nbodies ? &s->body[b] : NULL;
}

const sr_proportion *sr_disp_stats_limit(const sr_disp_stats *s, sr_limit_kind k)
{
    return (int)k >= 0 && (int)k < SR_DISP_NLIMITS ? &s->limit[k] : NULL;
}

const sr_proportion *sr_disp_stats_any(const sr_disp_stats *s)
{
    return &s->any;
}
