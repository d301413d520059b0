/* test_plot.c - gnuplot data files and scripts: every series kind renders
 * under the real gnuplot to a PNG of the requested size (PNG header checked
 * against the PNG specification), a script gnuplot rejects is an error, data
 * read back equal, hostile text stays text, and a missing style falls back. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "output/plot.h"
#include "output/report.h"
#include "testutil.h"

static char tmpdir[256];
static char gnuplot[1024];

static int setup(void **state)
{
    (void)state;
    snprintf(tmpdir, sizeof tmpdir, "/tmp/sinkrate-plot-XXXXXX");
    if (!mkdtemp(tmpdir))
        return -1;
    if (!sr_plot_find_gnuplot(gnuplot, sizeof gnuplot)) {
        fprintf(stderr, "test_plot: gnuplot is not on PATH (Debian package gnuplot-nox)\n");
        return -1;
    }
    return 0;
}

static int teardown(void **state)
{
    (void)state;
    sr_test_rmtree(tmpdir);
    return 0;
}

static const char *tpath(const char *name)
{
    static char buf[8][512];
    static int k;
    char *b = buf[k++ % 8];
    snprintf(b, 512, "%s/%s", tmpdir, name);
    return b;
}

/* A figure with every kind of series, markers and two panels. */
static sr_plot *full_figure(const char *title)
{
    sr_plot *p = sr_plot_new(title);
    assert_non_null(p);
    assert_int_equal(sr_plot_subtitle(p, "test figure; shaded: a band"), 0);
    assert_int_equal(sr_plot_layout(p, 2, 0), 0);
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.xlabel = "descent rate [m/s]";
    a.ylabel = "altitude [m]";
    a.title = "curves and bands";
    assert_int_equal(sr_plot_set_axes(p, 0, &a), 0);
    sr_plot_axes_init(&a);
    a.xlabel = "east [m]";
    a.ylabel = "north [m]";
    a.title = "scatter, ellipses, bars";
    a.equal = 1;
    a.key = SR_PLOT_KEY_BOTTOM_LEFT;
    assert_int_equal(sr_plot_set_axes(p, 1, &a), 0);
    const char *names[] = {"z_m", "lo", "typ", "hi"};
    for (int k = 0; k < 2; k++) {
        size_t b;
        assert_int_equal(sr_plot_block(p, k ? "second" : "first", 4, names, &b), 0);
        for (int i = 0; i <= 20; i++) {
            double z = 150.0 * i, v = (k ? 9.0 : 5.0) * exp(z / 20000.0);
            double row[4] = {z, 0.95 * v, v, 1.05 * v};
            assert_int_equal(sr_plot_row(p, b, row), 0);
        }
        sr_plot_series band = {.kind = k ? SR_PLOT_BAND : SR_PLOT_BAND_X, .panel = 0, .block = b, .lo = 2, .hi = 4,
                               .color = k + 1};
        if (k)
            band.x = 1;
        else
            band.y = 1;
        assert_int_equal(sr_plot_add(p, &band), 0);
        sr_plot_series line = {.kind = k ? SR_PLOT_LINESPOINTS : SR_PLOT_LINES, .panel = 0, .block = b,
                               .x = k ? 1 : 3, .y = k ? 3 : 1, .color = k + 1, .dash = k,
                               .title = k ? "second curve" : "first curve"};
        assert_int_equal(sr_plot_add(p, &line), 0);
    }
    assert_int_equal(sr_plot_marker(p, 0, 'x', 6.1, "limit", 0), 0);
    assert_int_equal(sr_plot_marker(p, 0, 'y', 250.0, "deployment", 1), 0);
    const char *en[] = {"x", "y", "w", "h", "angle"};
    size_t eb, pb, hb;
    assert_int_equal(sr_plot_block(p, "ellipses", 5, en, &eb), 0);
    double e1[5] = {0, 0, 400, 200, 30}, e3[5] = {0, 0, 1200, 600, 30};
    sr_plot_row(p, eb, e1);
    sr_plot_row(p, eb, e3);
    sr_plot_series es = {.kind = SR_PLOT_ELLIPSES, .panel = 1, .block = eb, .x = 1, .y = 2, .w = 3, .h = 4,
                         .angle = 5, .title = "ellipses"};
    assert_int_equal(sr_plot_add(p, &es), 0);
    const char *pn[] = {"x", "y"};
    assert_int_equal(sr_plot_block(p, "points", 2, pn, &pb), 0);
    for (int i = 0; i < 50; i++) {
        double r[2] = {200.0 * sin(i * 1.3), 100.0 * cos(i * 0.7)};
        sr_plot_row(p, pb, r);
    }
    sr_plot_series ps = {.kind = SR_PLOT_POINTS, .panel = 1, .block = pb, .x = 1, .y = 2, .title = "points"};
    assert_int_equal(sr_plot_add(p, &ps), 0);
    const char *hn[] = {"centre", "count", "width"};
    assert_int_equal(sr_plot_block(p, "histogram", 3, hn, &hb), 0);
    for (int i = 0; i < 6; i++) {
        double r[3] = {-500.0 + 200.0 * i, -900.0 + 50.0 * i * (6 - i), 180.0};
        sr_plot_row(p, hb, r);
    }
    sr_plot_series bs = {.kind = SR_PLOT_BOXES, .panel = 1, .block = hb, .x = 1, .y = 2, .w = 3, .title = "bars"};
    assert_int_equal(sr_plot_add(p, &bs), 0);
    assert_int_equal(sr_plot_marker(p, 1, 'y', -950.0, NULL, 1), 0);
    return p;
}

static void render_png(const char *name, int width, int height)
{
    sr_plot *p = full_figure("every kind of series");
    sr_plot_out o = {.prefix = tpath(name), .style = sr_test_path("plots/sinkrate.gp"), .format = "png",
                     .width = width, .height = height, .command = "test_plot"};
    sr_error e;
    int rc = sr_plot_write(p, &o, &e);
    if (rc)
        fail_msg("%s", e.msg);
    char diag[4096];
    rc = sr_plot_render(NULL, gnuplot, o.prefix, "png", diag, sizeof diag, &e);
    if (rc)
        fail_msg("%s", e.msg);
    /* gnuplot said nothing: no warning about empty data, bad ranges or fonts */
    if (diag[0])
        fail_msg("gnuplot warned: %s", diag);
    char png[600];
    snprintf(png, sizeof png, "%s.png", o.prefix);
    unsigned w = 0, h = 0;
    assert_true(sr_test_png_size(png, &w, &h));
    char q[128];
    snprintf(q, sizeof q, "PNG width from IHDR, figure of %dx%d px", width, height);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, q, SR_SRC_PNG, width, w, 0);
    snprintf(q, sizeof q, "PNG height from IHDR, figure of %dx%d px", width, height);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, q, SR_SRC_PNG, height, h, 0);
    sr_plot_free(p);
}

static void test_png_sizes(void **state)
{
    (void)state;
    render_png("full-a", 1000, 650);
    render_png("full-b", 640, 480);
}

/* Two panels one above the other, bands drawn as dotted edges, a legend strip. */
static void test_stacked_outlined(void **state)
{
    (void)state;
    sr_plot *p = sr_plot_new("stacked");
    assert_int_equal(sr_plot_layout(p, 2, 1), 0);
    sr_plot_axes a;
    for (int k = 0; k < 2; k++) {
        sr_plot_axes_init(&a);
        a.xlabel = "x [m]";
        a.ylabel = k ? "second [s]" : "first [m/s]";
        a.key = SR_PLOT_KEY_ABOVE;
        a.xtight = 1;
        assert_int_equal(sr_plot_set_axes(p, k, &a), 0);
    }
    const char *n[] = {"x", "lo", "typ", "hi"};
    for (int c = 0; c < 5; c++) {
        size_t b;
        sr_plot_block(p, "curve", 4, n, &b);
        for (int i = 0; i < 30; i++) {
            double y = (c + 1) * sqrt(i + 1.0), r[4] = {i, 0.9 * y, y, 1.1 * y};
            sr_plot_row(p, b, r);
        }
        for (int k = 0; k < 2; k++) {
            sr_plot_series band = {.kind = k ? SR_PLOT_BAND_X : SR_PLOT_BAND, .panel = k, .block = b,
                                   .x = k ? 0 : 1, .y = k ? 1 : 0, .lo = 2, .hi = 4, .color = c + 1, .outline = 1};
            assert_int_equal(sr_plot_add(p, &band), 0);
            char title[32];
            snprintf(title, sizeof title, "curve %d", c + 1);
            sr_plot_series line = {.kind = SR_PLOT_LINES, .panel = k, .block = b, .x = k ? 3 : 1, .y = k ? 1 : 3,
                                   .color = c + 1, .title = k ? NULL : title};
            assert_int_equal(sr_plot_add(p, &line), 0);
        }
    }
    sr_plot_out o = {.prefix = tpath("stacked"), .style = sr_test_path("plots/sinkrate.gp"), .format = "png",
                     .width = 700, .height = 900};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    char diag[2048];
    int rc = sr_plot_render(NULL, gnuplot, o.prefix, "png", diag, sizeof diag, &e);
    if (rc)
        fail_msg("%s", e.msg);
    if (diag[0])
        fail_msg("gnuplot warned: %s", diag);
    unsigned w, h;
    assert_true(sr_test_png_size(tpath("stacked.png"), &w, &h));
    assert_int_equal(w, 700);
    assert_int_equal(h, 900);
    /* outlined bands need no outline polygon blocks: five curve blocks only */
    char *dat = sr_test_slurp(tpath("stacked.dat"), NULL);
    assert_null(strstr(dat, "outline of the band"));
    free(dat);
    sr_plot_free(p);
}

/* Log-log axes with a curve, filled and open points and labels beside
 * points, after a block without rows: the script asks for what was set, and
 * gnuplot draws it without a warning (a lost index warns of no valid points). */
static void test_log_axes_open_points_labels(void **state)
{
    (void)state;
    sr_plot *p = sr_plot_new("log axes");
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.xlabel = "Reynolds number";
    a.ylabel = "drag coefficient";
    a.xlog = a.ylog = 1;
    a.xmin = 1e2;
    a.xmax = 1e7;
    a.ymin = 0.02;
    a.ymax = 2;
    a.key = SR_PLOT_KEY_ABOVE;
    assert_int_equal(sr_plot_set_axes(p, 0, &a), 0);
    const char *n[] = {"Re", "Cd"};
    size_t curve, filled, open;
    assert_int_equal(sr_plot_block(p, "curve", 2, n, &curve), 0);
    for (int i = 0; i <= 50; i++) {
        double re = 1e2 * pow(10.0, i / 10.0), r[2] = {re, re < 3e5 ? 0.47 : 0.1};
        sr_plot_row(p, curve, r);
    }
    double f[2] = {1e4, 0.47}, o[2] = {3e5, 0.2};
    size_t none;
    assert_int_equal(sr_plot_block(p, "a block without rows keeps its index", 2, n, &none), 0);
    assert_int_equal(sr_plot_block(p, "filled", 2, n, &filled), 0);
    assert_int_equal(sr_plot_row(p, filled, f), 0);
    assert_int_equal(sr_plot_block(p, "open", 2, n, &open), 0);
    assert_int_equal(sr_plot_row(p, open, o), 0);
    sr_plot_series sc = {.kind = SR_PLOT_LINES, .block = curve, .x = 1, .y = 2, .title = "curve"};
    sr_plot_series sf = {.kind = SR_PLOT_POINTS, .block = filled, .x = 1, .y = 2, .color = 7, .title = "filled"};
    sr_plot_series so = {.kind = SR_PLOT_POINTS, .block = open, .x = 1, .y = 2, .color = 7, .open = 1,
                         .title = "open"};
    assert_int_equal(sr_plot_add(p, &sc), 0);
    assert_int_equal(sr_plot_add(p, &sf), 0);
    assert_int_equal(sr_plot_add(p, &so), 0);
    assert_int_equal(sr_plot_label(p, 0, f[0], f[1], "22.9 m/s, stable"), 0);
    assert_int_equal(sr_plot_label(p, 0, o[0], o[1], "it's open"), 0);
    assert_int_equal(sr_plot_label(p, 0, NAN, 1, "x"), SR_EINVAL);
    assert_int_equal(sr_plot_label(p, 2, 1, 1, "x"), SR_EINVAL);
    sr_plot_out out = {.prefix = tpath("log"), .style = sr_test_path("plots/sinkrate.gp"), .format = "png",
                       .width = 800, .height = 500};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &out, &e), 0);
    char *gp = sr_test_slurp(tpath("log.gp"), NULL);
    assert_non_null(gp);
    assert_non_null(strstr(gp, "set logscale x\nset logscale y\n"));
    assert_non_null(strstr(gp, "with points lt 7 pt 6"));
    assert_non_null(strstr(gp, "'22.9 m/s, stable' at graph ")); /* beside its point, where it hides no data */
    assert_non_null(strstr(gp, "'it''s open'"));
    free(gp);
    char diag[2048];
    int rc = sr_plot_render(NULL, gnuplot, out.prefix, "png", diag, sizeof diag, &e);
    if (rc)
        fail_msg("%s", e.msg);
    if (diag[0])
        fail_msg("gnuplot warned: %s", diag);
    unsigned w, h;
    assert_true(sr_test_png_size(tpath("log.png"), &w, &h));
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, "PNG width from IHDR, log-axes figure of 800x500 px", SR_SRC_PNG, 800, w, 0);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, "PNG height from IHDR, log-axes figure of 800x500 px", SR_SRC_PNG, 500, h, 0);
    sr_plot_free(p);
}

static void test_svg(void **state)
{
    (void)state;
    sr_plot *p = full_figure("svg");
    sr_plot_out o = {.prefix = tpath("svg"), .style = sr_test_path("plots/sinkrate.gp"), .format = "svg",
                     .width = 800, .height = 500};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    int rc = sr_plot_render(NULL, gnuplot, o.prefix, "svg", NULL, 0, &e);
    if (rc)
        fail_msg("%s", e.msg);
    char *svg = sr_test_slurp(tpath("svg.svg"), NULL);
    assert_non_null(svg);
    assert_non_null(strstr(svg, "<svg"));
    assert_non_null(strstr(svg, "width=\"800\""));
    assert_non_null(strstr(svg, "height=\"500\""));
    /* the caution is on the figure (the footnote's first words) */
    assert_non_null(strstr(svg, "preliminary engineering estimates"));
    free(svg);
    sr_plot_free(p);
}

static void test_caution_and_data_round_trip(void **state)
{
    (void)state;
    sr_plot *p = sr_plot_new("round trip");
    const char *n[] = {"a", "b", "c"};
    size_t b;
    assert_int_equal(sr_plot_block(p, "numbers", 3, n, &b), 0);
    double rows[3][3] = {{1.0, -2.5e-7, 123456.789}, {0.1, 3.0e8, -0.0}, {NAN, 42.0, 1.0 / 3.0}};
    for (int i = 0; i < 3; i++)
        sr_plot_row(p, b, rows[i]);
    sr_plot_series s = {.kind = SR_PLOT_LINES, .block = b, .x = 1, .y = 2};
    assert_int_equal(sr_plot_add(p, &s), 0);
    sr_plot_out o = {.prefix = tpath("rt"), .style = sr_test_path("plots/sinkrate.gp"), .format = "png",
                     .width = 400, .height = 300};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    char *dat = sr_test_slurp(tpath("rt.dat"), NULL), *gp = sr_test_slurp(tpath("rt.gp"), NULL);
    assert_non_null(dat);
    assert_non_null(gp);
    /* the caution's opening words in both files */
    assert_non_null(strstr(dat, "# CAUTION: preliminary engineering estimates only."));
    assert_non_null(strstr(gp, "# CAUTION: preliminary engineering estimates only."));
    assert_non_null(strstr(gp, "caution = 'CAUTION: preliminary"));
    /* numbers read back to 9 significant digits */
    int i = 0;
    for (char *line = strtok(dat, "\n"); line; line = strtok(NULL, "\n")) {
        if (line[0] == '#')
            continue;
        double v[3];
        char *end = line;
        for (int c = 0; c < 3; c++)
            v[c] = strtod(end, &end);
        for (int c = 0; c < 3; c++) {
            if (isnan(rows[i][c]))
                assert_true(isnan(v[c]));
            else
                assert_true(fabs(v[c] - rows[i][c]) <= 1e-8 * fabs(rows[i][c]));
        }
        i++;
    }
    assert_int_equal(i, 3);
    free(dat);
    free(gp);
    sr_plot_free(p);
}

static void test_rejected_script(void **state)
{
    (void)state;
    sr_plot *p = full_figure("rejected");
    sr_plot_out o = {.prefix = tpath("bad"), .style = sr_test_path("plots/sinkrate.gp"), .format = "png",
                     .width = 500, .height = 400};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    sr_plot_free(p);
    /* spoil the script the way a careless edit would */
    FILE *f = fopen(tpath("bad.gp"), "a");
    assert_non_null(f);
    fputs("set xrange [1:\n", f);
    fclose(f);
    int rc = sr_plot_render(NULL, gnuplot, o.prefix, "png", NULL, 0, &e);
    assert_int_equal(rc, SR_EIO);
    assert_non_null(strstr(e.msg, "gnuplot rejected"));
    assert_non_null(strstr(e.msg, "line"));
    assert_null(strchr(e.msg, '\n'));
    /* no figure and no temporary file left behind */
    char cmd[600];
    snprintf(cmd, sizeof cmd, "ls '%s' | grep -q 'bad.png'", tmpdir);
    assert_int_not_equal(system(cmd), 0);
}

static void test_hostile_text(void **state)
{
    (void)state;
    const char *marker = tpath("pwned");
    char title[700];
    snprintf(title, sizeof title, "it's `touch %s` @foo \"q\" \\n back\\slash\nnewline", marker);
    sr_plot *p = sr_plot_new(title);
    sr_plot_subtitle(p, title);
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.xlabel = title;
    a.ylabel = "y_{1}^2 & ~x";
    sr_plot_set_axes(p, 0, &a);
    const char *n[] = {"x", "y"};
    size_t b;
    sr_plot_block(p, title, 2, n, &b);
    for (int i = 0; i < 5; i++) {
        double r[2] = {i, i * i};
        sr_plot_row(p, b, r);
    }
    sr_plot_series s = {.kind = SR_PLOT_LINES, .block = b, .x = 1, .y = 2, .title = title};
    sr_plot_add(p, &s);
    sr_plot_marker(p, 0, 'y', 3.0, title, 0);
    sr_plot_out o = {.prefix = tpath("it's a \"prefix\""), .style = sr_test_path("plots/sinkrate.gp"),
                     .format = "png", .width = 500, .height = 400};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    int rc = sr_plot_render(NULL, gnuplot, o.prefix, "png", NULL, 0, &e);
    if (rc)
        fail_msg("%s", e.msg);
    assert_int_not_equal(access(marker, F_OK), 0);
    unsigned w, h;
    char png[600];
    snprintf(png, sizeof png, "%s.png", o.prefix);
    assert_true(sr_test_png_size(png, &w, &h));
    sr_plot_free(p);
}

static void test_missing_style_falls_back(void **state)
{
    (void)state;
    sr_plot *p = full_figure("no style");
    sr_plot_out o = {.prefix = tpath("nostyle"), .style = "/nonexistent/plots/sinkrate.gp", .format = "png",
                     .width = 600, .height = 400};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    char *gp = sr_test_slurp(tpath("nostyle.gp"), NULL);
    assert_non_null(strstr(gp, "set label 100 caution"));
    free(gp);
    int rc = sr_plot_render(NULL, gnuplot, o.prefix, "png", NULL, 0, &e);
    if (rc)
        fail_msg("%s", e.msg);
    unsigned w, h;
    assert_true(sr_test_png_size(tpath("nostyle.png"), &w, &h));
    assert_int_equal(w, 600);
    sr_plot_free(p);
}

/* A script moved with its data to another directory renders from a third
 * one: the shared style is inside it and no path of the tree that wrote it
 * is (the issue: "Cannot load input from 'sinkrate.gp'"). */
static void test_moved_script_renders(void **state)
{
    (void)state;
    sr_plot *p = full_figure("moved");
    char made[600], moved[600], cwd[600], old[4096];
    snprintf(made, sizeof made, "%s/made", tmpdir);
    snprintf(moved, sizeof moved, "%s/moved elsewhere", tmpdir);
    snprintf(cwd, sizeof cwd, "%s/another", tmpdir);
    assert_int_equal(mkdir(made, 0755), 0);
    assert_int_equal(mkdir(moved, 0755), 0);
    assert_int_equal(mkdir(cwd, 0755), 0);
    char prefix[700];
    snprintf(prefix, sizeof prefix, "%s/fig", made);
    sr_plot_out o = {.prefix = prefix, .style = sr_test_path("plots/sinkrate.gp"), .format = "png", .width = 700,
                     .height = 450};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    char *gp = sr_test_slurp(tpath("made/fig.gp"), NULL);
    assert_non_null(gp);
    assert_null(strstr(gp, "set loadpath"));
    assert_null(strstr(gp, sr_test_path("plots")));
    assert_null(strstr(gp, made));
    assert_non_null(strstr(gp, "sr_gridline")); /* the style is in it */
    free(gp);
    const char *ext[] = {"gp", "dat"};
    for (int k = 0; k < 2; k++) {
        char a[800], b[800];
        snprintf(a, sizeof a, "%s/fig.%s", made, ext[k]);
        snprintf(b, sizeof b, "%s/fig.%s", moved, ext[k]);
        assert_int_equal(rename(a, b), 0);
    }
    assert_int_equal(rmdir(made), 0);
    assert_non_null(getcwd(old, sizeof old));
    assert_int_equal(chdir(cwd), 0);
    char cmd[2048];
    snprintf(cmd, sizeof cmd, "'%s' '../moved elsewhere/fig.gp' 2>&1", gnuplot);
    FILE *f = popen(cmd, "r");
    char out[1024] = "";
    size_t n = f ? fread(out, 1, sizeof out - 1, f) : 0;
    out[n] = '\0';
    int rc = f ? pclose(f) : -1;
    assert_int_equal(chdir(old), 0);
    if (rc != 0 || out[0])
        fail_msg("the moved script did not render cleanly (exit %d): %s", rc, out);
    unsigned w, h;
    assert_true(sr_test_png_size(tpath("moved elsewhere/fig.png"), &w, &h));
    assert_int_equal(w, 700);
    assert_int_equal(sr_plot_check_image(tpath("moved elsewhere/fig.png"), "png", "the moved figure", &e), 0);
    sr_plot_free(p);
}

/* Labels of marker lines that would collide are staggered into rows, two
 * lines at one place share one label, a marker line at the end of the data
 * moves the range's end off it, and the legend goes into a corner free of
 * data (the figures: close deployments printed on top of each other,
 * a mark line on the frame, a legend over the descent-rate curve). */
static void test_layout_keeps_data_visible(void **state)
{
    (void)state;
    sr_plot *p = sr_plot_new("layout");
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.xlabel = "time [s]";
    a.ylabel = "speed [m/s]";
    a.xtight = 1;
    a.ymin = 0;
    assert_int_equal(sr_plot_set_axes(p, 0, &a), 0);
    const char *n[] = {"t", "v"};
    size_t b;
    assert_int_equal(sr_plot_block(p, "descent", 2, n, &b), 0);
    for (int i = 0; i <= 100; i++) { /* fast, then slow after 60 s: the top right is free, the top left is not */
        double row[2] = {1.0 * i, i < 60 ? 25.0 - 0.05 * i : 6.0};
        assert_int_equal(sr_plot_row(p, b, row), 0);
    }
    sr_plot_series s = {.kind = SR_PLOT_LINES, .block = b, .x = 1, .y = 2, .title = "descent rate"};
    assert_int_equal(sr_plot_add(p, &s), 0);
    assert_int_equal(sr_plot_marker(p, 0, 'x', 60.0, "main", 1), 0);
    assert_int_equal(sr_plot_marker(p, 0, 'x', 61.0, "reserve", 1), 0);  /* 1 s later: a row above */
    assert_int_equal(sr_plot_marker(p, 0, 'x', 60.0, "payload", 1), 0);  /* the same line: merged */
    assert_int_equal(sr_plot_marker(p, 0, 'y', 25.0, "limit", 0), 0);     /* at the data's top */
    assert_int_equal(sr_plot_marker(p, 0, 'x', 100.0, "touchdown", 1), 0); /* at the data's end */
    sr_plot_out o = {.prefix = tpath("layout"), .style = sr_test_path("plots/sinkrate.gp"), .format = "png",
                     .width = 800, .height = 500};
    sr_error e;
    assert_int_equal(sr_plot_write(p, &o, &e), 0);
    char *gp = sr_test_slurp(tpath("layout.gp"), NULL);
    assert_non_null(gp);
    assert_non_null(strstr(gp, "'main, payload' at first 60, graph 1 left offset -0.4,0.75"));
    assert_non_null(strstr(gp, "'reserve' at first 61, graph 1 left offset -0.4,1.80"));
    assert_null(strstr(gp, "'payload' at"));
    /* the touchdown label runs past the figure's edge no more: right-aligned at its line */
    assert_non_null(strstr(gp, "'touchdown' at first 100, graph 1 right"));
    /* neither marker line on the frame: the ranges reach past 100 s and 25 m/s */
    double x0, x1, y0, y1;
    const char *xr = strstr(gp, "set xrange ["), *yr = strstr(gp, "set yrange [");
    assert_non_null(xr);
    assert_non_null(yr);
    assert_int_equal(sscanf(xr, "set xrange [%lf:%lf]", &x0, &x1), 2);
    assert_int_equal(sscanf(yr, "set yrange [%lf:%lf]", &y0, &y1), 2);
    assert_true(x1 > 100.0 + 0.01 * (x1 - x0));
    assert_true(y1 > 25.0 + 0.01 * (y1 - y0));
    /* the legend: our box in a corner the curve leaves free, gnuplot's key off */
    assert_non_null(strstr(gp, "unset key"));
    const char *box = strstr(gp, "# the legend, in a corner the data leave free\nset object 400 rect from graph ");
    assert_non_null(box);
    double bx0, by0;
    assert_int_equal(sscanf(box + strlen("# the legend, in a corner the data leave free\nset object 400 rect from "),
                            "graph %lf, graph %lf", &bx0, &by0),
                     2);
    /* clear of the curve: above its highest value (25 m/s until 60 s), or right of 60 s above 6 m/s */
    double top = (25.0 - y0) / (y1 - y0), after = (60.0 - x0) / (x1 - x0), low = (6.0 - y0) / (y1 - y0);
    if (!(by0 > top || (bx0 > after && by0 > low)))
        fail_msg("the legend at graph %g, %g covers the curve (top %g, after %g)", bx0, by0, top, after);
    free(gp);
    assert_int_equal(sr_plot_render(NULL, gnuplot, o.prefix, "png", NULL, 0, &e), 0);
    sr_plot_free(p);
}

static void test_bad_requests(void **state)
{
    (void)state;
    sr_plot *p = sr_plot_new("bad");
    const char *n[] = {"x", "y"};
    size_t b;
    assert_int_equal(sr_plot_block(p, "b", 2, n, &b), 0);
    sr_plot_series s = {.kind = SR_PLOT_LINES, .block = b, .x = 1, .y = 3};
    assert_int_equal(sr_plot_add(p, &s), SR_EINVAL); /* no column 3 */
    s.y = 2;
    s.block = 7;
    assert_int_equal(sr_plot_add(p, &s), SR_EINVAL); /* no block 7 */
    assert_int_equal(sr_plot_marker(p, 0, 'z', 1.0, NULL, 0), SR_EINVAL);
    assert_int_equal(sr_plot_layout(p, 3, 0), SR_EINVAL);
    s.block = b;
    assert_int_equal(sr_plot_add(p, &s), 0);
    sr_error e;
    /* a block without rows: nothing to draw */
    sr_plot_out o = {.prefix = tpath("empty"), .format = "png", .width = 400, .height = 300};
    assert_int_equal(sr_plot_write(p, &o, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "no data"));
    double r[2] = {1, 2};
    sr_plot_row(p, b, r);
    o.prefix = tpath("no/such/dir/x");
    assert_int_equal(sr_plot_write(p, &o, &e), SR_EIO);
    o.prefix = tpath("fmt");
    o.format = "gif";
    assert_int_equal(sr_plot_write(p, &o, &e), SR_EINVAL);
    o.format = "png";
    o.width = 10;
    assert_int_equal(sr_plot_write(p, &o, &e), SR_EINVAL);
    sr_plot_free(p);
}

/* A figure counts only when complete: the PNG chunk layout (ISO/IEC
 * 15948:2004, sec. 5.2 signature, 5.3 chunk = length, type, data, CRC, 11.2.5
 * IEND last) or an SVG closed by its root element. */
static void test_image_complete(void **state)
{
    (void)state;
    static const unsigned char SIG[8] = {0x89, 'P', 'N', 'G', 0x0d, 0x0a, 0x1a, 0x0a};
    static const unsigned char IHDR[25] = {0, 0, 0, 13, 'I', 'H', 'D', 'R', 0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0,
                                           0x90, 0x77, 0x53, 0xde};
    static const unsigned char IDAT[16] = {0, 0, 0, 4, 'I', 'D', 'A', 'T', 1, 2, 3, 4, 9, 9, 9, 9};
    static const unsigned char IEND[12] = {0, 0, 0, 0, 'I', 'E', 'N', 'D', 0xae, 0x42, 0x60, 0x82};
    unsigned char png[8 + 25 + 16 + 12 + 4];
    size_t n = 0;
    memcpy(png + n, SIG, 8), n += 8;
    memcpy(png + n, IHDR, 25), n += 25;
    memcpy(png + n, IDAT, 16), n += 16;
    memcpy(png + n, IEND, 12), n += 12;
    memcpy(png + n, "junk", 4);
    const char *svg = "<?xml version=\"1.0\"?>\n<svg width=\"10\" height=\"10\">\n<g/>\n</svg>\n\n";
    static const struct {
        const char *what, *format;
        int svg;       /* content from svg, else from png */
        size_t len;    /* bytes of it (SIZE_MAX: all of the string) */
        int ok;
    } ROWS[] = {
        {"a complete PNG", "png", 0, 8 + 25 + 16 + 12, 1},
        {"a PNG cut inside a chunk (a full disk)", "png", 0, 8 + 25 + 10, 0},
        {"a PNG without its IEND chunk", "png", 0, 8 + 25 + 16, 0},
        {"a PNG cut inside IEND", "png", 0, 8 + 25 + 16 + 8, 0},
        {"bytes after IEND", "png", 0, sizeof png, 0},
        {"no PNG signature", "png", 1, (size_t)-1, 0},
        {"an empty file", "png", 0, 0, 0},
        {"a complete SVG", "svg", 1, (size_t)-1, 1},
        {"an SVG cut before </svg>", "svg", 1, 40, 0},
        {"a PNG named .svg", "svg", 0, 8 + 25 + 16 + 12, 0},
    };
    for (size_t i = 0; i < sizeof ROWS / sizeof ROWS[0]; i++) {
        FILE *f = fopen(tpath("img"), "wb");
        assert_non_null(f);
        size_t len = ROWS[i].svg ? (ROWS[i].len == (size_t)-1 ? strlen(svg) : ROWS[i].len) : ROWS[i].len;
        fwrite(ROWS[i].svg ? (const void *)svg : (const void *)png, 1, len, f);
        fclose(f);
        sr_error e;
        int rc = sr_plot_check_image(tpath("img"), ROWS[i].format, "fig", &e);
        if ((rc == SR_OK) != ROWS[i].ok)
            print_error("image row %zu (%s): rc %d %s\n", i, ROWS[i].what, rc, rc ? e.msg : "");
        assert_int_equal(rc == SR_OK, ROWS[i].ok);
        if (!ROWS[i].ok)
            assert_non_null(strstr(e.msg, "fig: gnuplot wrote an incomplete"));
    }
    unlink(tpath("img"));
}

static void test_find_gnuplot_follows_path(void **state)
{
    (void)state;
    char *old = strdup(getenv("PATH") ? getenv("PATH") : "");
    char buf[1024];
    setenv("PATH", tmpdir, 1);
    assert_int_equal(sr_plot_find_gnuplot(buf, sizeof buf), 0);
    setenv("PATH", old, 1);
    assert_int_equal(sr_plot_find_gnuplot(buf, sizeof buf), 1);
    assert_non_null(strstr(buf, "gnuplot"));
    free(old);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_image_complete),
        cmocka_unit_test(test_png_sizes),
        cmocka_unit_test(test_stacked_outlined),
        cmocka_unit_test(test_log_axes_open_points_labels),
        cmocka_unit_test(test_svg),
        cmocka_unit_test(test_caution_and_data_round_trip),
        cmocka_unit_test(test_rejected_script),
        cmocka_unit_test(test_hostile_text),
        cmocka_unit_test(test_missing_style_falls_back),
        cmocka_unit_test(test_moved_script_renders),
        cmocka_unit_test(test_layout_keeps_data_visible),
        cmocka_unit_test(test_bad_requests),
        cmocka_unit_test(test_find_gnuplot_follows_path),
    };
    return cmocka_run_group_tests_name("plot", tests, setup, teardown);
}
