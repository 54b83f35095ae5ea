/* test_svg.c - SVG writer: ticks over awkward ranges, data <-> pixel mapping,
 * well-formed XML, and every figure's plotted points read back through the
 * figure's own tick labels to within half a pixel. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "support.h"
#include "holdfast/svg.h"
#include "xml_check.h"

/* The checker itself must reject broken documents, or the checks above
 * could not fail. */
static void test_xml_checker_rejects(void **state)
{
    (void)state;
    assert_null(hf_test_xml_check("<svg a=\"1\"><g/><text>x &amp; y</text></svg>"));
    assert_null(hf_test_xml_check("<?xml version=\"1.0\"?>\n<!-- c --><a><b></b></a>\n"));
    assert_null(hf_test_xml_check("<!DOCTYPE html>\n<html><p>&#215;&#x3b1;</p></html>"));
    static const char *const bad[] = {
        "<a><b></a></b>",
        "<a>",
        "<a></a><b></b>",
        "<a x=1></a>",
        "<a x=\"1\" x=\"2\"/>",
        "<a>1 < 2</a>",
        "<a>R&D</a>",
        "<a x=\"<\"/>",
        "text<a/>",
        "<a>\x01</a>",
        "</a>",
        "<a><!-- x</a>",
        "<1a/>",
        "<a>&bogus;</a>",
        "<a x=\"1\"y=\"2\"/>",
    };
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++)
        if (!hf_test_xml_check(bad[i])) {
            print_error("accepted: %s\n", bad[i]);
            fail();
        }
}

/* ---- reading an SVG back --------------------------------------------------- */

/* Value of attribute `name` in the tag starting at tag (up to its '>'). */
static int attr(const char *tag, const char *name, char *buf, size_t cap)
{
    const char *end = strchr(tag, '>');
    size_t nl = strlen(name);
    for (const char *p = tag; p && p < end; p++) {
        if (p[-1] == ' ' && !strncmp(p, name, nl) && p[nl] == '=' && p[nl + 1] == '"') {
            const char *v = p + nl + 2, *ve = strchr(v, '"');
            size_t l = (size_t)(ve - v);
            if (l >= cap)
                l = cap - 1;
            memcpy(buf, v, l);
            buf[l] = '\0';
            return 1;
        }
    }
    return 0;
}

static double attr_num(const char *tag, const char *name)
{
    char b[64];
    if (!attr(tag, name, b, sizeof b))
        return NAN;
    return strtod(b, NULL);
}

/* A linear pixel = a + b * value fit, by least squares through the tick
 * labels of one axis. */
typedef struct {
    double a, b;
    int n;
} fit;

static double fit_px(const fit *f, double v)
{
    return f->a + f->b * v;
}

/* Collects numeric tick labels: x-axis labels are middle-anchored texts at
 * pixel row `row` (x = their x); y-axis labels are end-anchored texts at
 * column `col` with row in [rmin, rmax] (pixel = y - 4, the baseline shift
 * the writer uses); x-axis labels are kept to columns [rmin, rmax] when
 * rmax > rmin.  row_or_col < 0: the row (column) most labels share. */
static fit axis_fit(const char *svg, int horizontal, double row_or_col, double rmin, double rmax)
{
    enum { CAP = 512 };
    static double val[CAP], tx[CAP], ty[CAP];
    size_t nc = 0;
    for (const char *p = strstr(svg, "<text "); p && nc < CAP; p = strstr(p + 1, "<text ")) {
        char anchor[16];
        attr(p, "text-anchor", anchor, sizeof anchor);
        if (strcmp(anchor, horizontal ? "middle" : "end"))
            continue;
        const char *body = strchr(p, '>') + 1;
        char *end;
        double v = strtod(body, &end);
        if (end == body || *end != '<')
            continue;
        val[nc] = v;
        tx[nc] = attr_num(p, "x");
        ty[nc++] = attr_num(p, "y");
    }
    if (row_or_col < 0) {
        size_t best = 0;
        for (size_t i = 0; i < nc; i++) {
            size_t k = 0;
            for (size_t j = 0; j < nc; j++)
                k += fabs((horizontal ? ty[j] - ty[i] : tx[j] - tx[i])) < 0.01;
            if (k > best) {
                best = k;
                row_or_col = horizontal ? ty[i] : tx[i];
            }
        }
        rmin = -1e9;
        rmax = 1e9;
    }
    double sx = 0, sy = 0, sxx = 0, sxy = 0;
    int n = 0;
    for (size_t i = 0; i < nc; i++) {
        double px;
        if (horizontal) {
            if (fabs(ty[i] - row_or_col) > 0.01 || (rmax > rmin && (tx[i] < rmin || tx[i] > rmax)))
                continue;
            px = tx[i];
        } else {
            if (fabs(tx[i] - row_or_col) > 0.01 || ty[i] < rmin || ty[i] > rmax)
                continue;
            px = ty[i] - 4;
        }
        sx += val[i];
        sy += px;
        sxx += val[i] * val[i];
        sxy += val[i] * px;
        n++;
    }
    fit f = {0, 0, n};
    assert_true(n >= 2);
    f.b = (n * sxy - sx * sy) / (n * sxx - sx * sx);
    f.a = (sy - f.b * sx) / n;
    return f;
}

/* Parses the k-th (0-based) polyline's points into xs/ys (cap entries);
 * returns the number of points, or -1 when there is no such polyline. */
static long polyline_points(const char *svg, const char *must_have, int k, double *xs, double *ys,
                            size_t cap)
{
    const char *p = svg;
    for (;;) {
        p = strstr(p, "<polyline ");
        if (!p)
            return -1;
        const char *e = strchr(p, '>');
        int match = 1;
        if (must_have) {
            const char *m = strstr(p, must_have);
            match = m && m < e;
        }
        if (match && k-- == 0)
            break;
        p = e;
    }
    const char *q = strstr(p, "points=\"") + 8;
    size_t n = 0;
    while (*q != '"') {
        char *end;
        double x = strtod(q, &end);
        assert_int_equal(*end, ',');
        double y = strtod(end + 1, &end);
        if (n < cap) {
            xs[n] = x;
            ys[n] = y;
        }
        n++;
        q = end;
        while (*q == ' ')
            q++;
    }
    return (long)n;
}

/* ---- ticks ----------------------------------------------------------------- */

/* Is s of the form {1, 2, 5} x 10^k?  The 1-2-5 "nice number" steps of
 * Heckbert (1990), "Nice numbers for graph labels", Graphics Gems I. */
static int one_two_five(double s)
{
    double k = floor(log10(s) + 1e-9);
    double m = s / pow(10.0, k);
    return fabs(m - 1) < 1e-9 || fabs(m - 2) < 1e-9 || fabs(m - 5) < 1e-9;
}

static void check_ticks(double lo, double hi, int target)
{
    hf_svg_ticks t;
    hf_error err;
    assert_int_equal(hf_svg_ticks_choose(lo, hi, target, &t, &err), HF_OK);
    double mn = fmin(lo, hi), mx = fmax(lo, hi);
    assert_true(one_two_five(t.step));
    assert_true(t.n >= 2 && t.n <= HF_SVG_MAX_TICKS);
    assert_true(t.lo <= mn + 1e-6 * t.step);
    assert_true(t.hi >= mx - 1e-6 * t.step);
    assert_true(t.hi > t.lo);
    /* not wastefully wide: at most one step of slack on each side, and no
     * more than about twice the intervals asked for */
    if (mx > mn && mx - mn > 2e-9 * fmax(fabs(mn), fabs(mx))) {
        assert_true(t.lo > mn - t.step * (1 + 1e-9));
        assert_true(t.hi < mx + t.step * (1 + 1e-9));
        assert_true(t.n - 1 <= (size_t)(2.5 * target) + 1);
    }
    /* ends are ticks: lo = first tick, hi = last tick */
    assert_true(fabs(hf_svg_tick_value(&t, 0) - t.lo) <= 1e-9 * t.step);
    assert_true(fabs(hf_svg_tick_value(&t, t.n - 1) - t.hi) <= 1e-9 * t.step);
    char prev[64] = "", lab[64];
    for (size_t i = 0; i < t.n; i++) {
        hf_svg_tick_label(&t, i, lab, sizeof lab);
        double v = hf_svg_tick_value(&t, i);
        char *end;
        double back = strtod(lab, &end);
        if (*end != '\0' || fabs(back - v) > 1e-6 * t.step) {
            print_error("range %g..%g tick %zu: label \"%s\" for %.17g\n", lo, hi, i, lab, v);
            fail();
        }
        assert_string_not_equal(lab, prev);
        assert_true(strlen(lab) <= 12);
        strcpy(prev, lab);
    }
}

static void test_ticks_awkward_ranges(void **state)
{
    (void)state;
    static const double r[][2] = {
        {0, 1e-9},          {1e-9, 3.7e-9},   {1e9, 1.5e9},      {-2.385e9, 7.1e8}, {-3.7, -1.2},
        {-5, 7.3},          {0, 812.4},       {-0.0021, 0.0173}, {2.385, 2.385},    {0, 0},
        {-1e9, -1e9},       {3e-12, 3e-12},   {1e-300, 3e-300},  {-1e300, 1e300},   {7.3, -5},
        {100, 100.0000001}, {1e6, 1e7},       {99999, 100001},   {0.1, 0.3},        {-812.4, 0},
        {5e-324, 5e-324},   {1234.5, 1234.6},
    };
    for (size_t i = 0; i < sizeof r / sizeof r[0]; i++)
        for (int target = 2; target <= 10; target += 4)
            check_ticks(r[i][0], r[i][1], target);
}

/* Hand-worked cases of the rule in svg.h (candidates: the three smallest
 * 1-2-5 steps not below span / (target + 2); at most target + 2 intervals;
 * least widened range wins, ties to the count nearest the target). */
static void test_ticks_exact_choices(void **state)
{
    (void)state;
    hf_svg_ticks t;
    /* 0..1e-9, 5: raw 1.43e-10; 2e-10 and 5e-10 both cover 0..1e-9 exactly,
     * 2e-10 gives 5 intervals (the target) -> 6 ticks */
    assert_int_equal(hf_svg_ticks_choose(0, 1e-9, 5, &t, NULL), HF_OK);
    assert_true(fabs(t.step - 2e-10) < 1e-24);
    assert_int_equal(t.n, 6);
    char lab[64];
    hf_svg_tick_label(&t, 1, lab, sizeof lab);
    assert_string_equal(lab, "2e-10");
    hf_svg_tick_label(&t, 5, lab, sizeof lab);
    assert_string_equal(lab, "1e-9");
    /* 1e9..1.5e9, 5: raw 7.1e7 -> 1e8 covers exactly, labels 1e9, 1.1e9 ... */
    assert_int_equal(hf_svg_ticks_choose(1e9, 1.5e9, 5, &t, NULL), HF_OK);
    assert_true(fabs(t.step - 1e8) < 1e-3);
    assert_int_equal(t.n, 6);
    hf_svg_tick_label(&t, 1, lab, sizeof lab);
    assert_string_equal(lab, "1.1e9");
    /* -3.7..-1.2, 5: raw 0.357 -> 0.5 and 1 both give -4..-1; 0.5 has 6
     * intervals, nearer 5 than 1's 3 */
    assert_int_equal(hf_svg_ticks_choose(-3.7, -1.2, 5, &t, NULL), HF_OK);
    assert_true(fabs(t.step - 0.5) < 1e-15 && fabs(t.lo + 4) < 1e-12 && fabs(t.hi + 1) < 1e-12);
    hf_svg_tick_label(&t, 1, lab, sizeof lab);
    assert_string_equal(lab, "-3.5");
    /* single value 2.385: 2.1465..2.6235, 5 -> raw 0.068 -> 0.1 gives 2.1..2.7 */
    assert_int_equal(hf_svg_ticks_choose(2.385, 2.385, 5, &t, NULL), HF_OK);
    assert_true(fabs(t.step - 0.1) < 1e-15 && fabs(t.lo - 2.1) < 1e-12 && fabs(t.hi - 2.7) < 1e-12);
    /* zero alone: -1..1 */
    assert_int_equal(hf_svg_ticks_choose(0, 0, 4, &t, NULL), HF_OK);
    assert_true(t.lo == -1 && t.hi == 1 && fabs(t.step - 0.5) < 1e-15);
    hf_svg_tick_label(&t, 2, lab, sizeof lab);
    assert_string_equal(lab, "0");
    /* 0..812.4, 8: raw 81.2 -> 100 gives 0..900 (9 intervals <= 10), 200
     * gives 0..1000: 100 wastes less */
    assert_int_equal(hf_svg_ticks_choose(0, 812.4, 8, &t, NULL), HF_OK);
    assert_true(t.step == 100 && t.lo == 0 && t.hi == 900);
    /* 0..806, 4: raw 134 -> 200 gives 0..1000 in 5 intervals (<= 6), 500
     * gives 0..1000 in 2; equal cover, and 5 is nearer 4 than 2 is */
    assert_int_equal(hf_svg_ticks_choose(0, 806, 4, &t, NULL), HF_OK);
    assert_true(t.step == 200 && t.lo == 0 && t.hi == 1000);
}

static void test_ticks_reject_nonfinite(void **state)
{
    (void)state;
    hf_svg_ticks t;
    hf_error err;
    hf_error_clear(&err);
    assert_int_equal(hf_svg_ticks_choose(NAN, 1, 5, &t, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "finite"));
    assert_int_equal(hf_svg_ticks_choose(0, INFINITY, 5, &t, NULL), HF_EINVAL);
    assert_int_equal(hf_svg_ticks_choose(0, strtod("1e309", NULL), 5, &t, NULL), HF_EINVAL);
    assert_int_equal(hf_svg_ticks_choose(-1.7e308, 0, 5, &t, NULL), HF_EINVAL);
    hf_svg_axes a;
    assert_int_equal(hf_svg_axes_init(&a, 0, 0, 0, 100, 0, 1, 0, 1, 0, NULL), HF_EINVAL);
    assert_int_equal(hf_svg_axes_init(&a, 0, 0, 100, NAN, 0, 1, 0, 1, 0, NULL), HF_EINVAL);
}

/* ---- mapping and primitives ------------------------------------------------ */

static void test_axes_mapping_round_trip(void **state)
{
    (void)state;
    hf_svg_axes a;
    assert_int_equal(hf_svg_axes_init(&a, 93.5, 41.25, 512.75, 287.5, -812.4, 1303.7, 2.385e-3,
                                      9.71e-3, 0, NULL),
                     HF_OK);
    /* corners map to the plot area corners */
    assert_true(fabs(hf_svg_axes_px(&a, a.xt.lo) - 93.5) < 1e-9);
    assert_true(fabs(hf_svg_axes_px(&a, a.xt.hi) - (93.5 + 512.75)) < 1e-9);
    assert_true(fabs(hf_svg_axes_py(&a, a.yt.lo) - (41.25 + 287.5)) < 1e-9);
    assert_true(fabs(hf_svg_axes_py(&a, a.yt.hi) - 41.25) < 1e-9);
    for (int i = 0; i < 1000; i++) {
        double x = -812.4 + 2116.1 * i / 999.0, y = 2.385e-3 + 7.325e-3 * ((i * 37) % 1000) / 999;
        assert_true(fabs(hf_svg_axes_data_x(&a, hf_svg_axes_px(&a, x)) - x) < 1e-9);
        assert_true(fabs(hf_svg_axes_data_y(&a, hf_svg_axes_py(&a, y)) - y) < 1e-15);
    }
    /* equal scale: one data unit is the same number of pixels on both axes */
    assert_int_equal(
        hf_svg_axes_init(&a, 100, 80, 620, 580, -912.5, 1004.25, -300.5, 287.1, 1, NULL), HF_OK);
    double sx = a.width / (a.xt.hi - a.xt.lo), sy = a.height / (a.yt.hi - a.yt.lo);
    assert_true(fabs(sx - sy) < 1e-12 * sx);
    assert_true(a.width <= 620 + 1e-9 && a.height <= 580 + 1e-9);
}

/* Long x tick labels never overlap: neighbouring ticks are at least one
 * label width (about 7.4 px a character at 12 px) plus a gap apart. */
static void test_axes_x_labels_fit(void **state)
{
    (void)state;
    static const double r[][2] = {
        {1.2345e9, 1.2350e9}, {-2.385e-7, 9.71e-7}, {-123456.7, 98765.4}, {0.000123, 0.000987}};
    for (size_t k = 0; k < 4; k++) {
        hf_svg_axes a;
        assert_int_equal(hf_svg_axes_init(&a, 90, 90, 300, 200, r[k][0], r[k][1], 0, 1, 0, NULL),
                         HF_OK);
        size_t w = 0;
        char lab[64];
        for (size_t i = 0; i < a.xt.n; i++) {
            hf_svg_tick_label(&a.xt, i, lab, sizeof lab);
            if (strlen(lab) > w)
                w = strlen(lab);
        }
        double gap = a.width / (double)(a.xt.n - 1);
        if (gap < 0.62 * 12 * (double)w + 10) {
            print_error("range %g..%g: %zu ticks %.1f px apart, labels %zu chars\n", r[k][0],
                        r[k][1], a.xt.n, gap, w);
            fail();
        }
        assert_true(a.xt.n >= 2);
    }
}

/* Plotted coordinates read back from the SVG text map to the data within
 * half a pixel. */
static void test_polyline_points_within_half_pixel(void **state)
{
    (void)state;
    enum { N = 2001 };
    static double x[N], y[N], px[N], py[N];
    for (int i = 0; i < N; i++) {
        x[i] = -25.0 + 50.0 * i / (N - 1);
        y[i] = 1.2e6 * tanh(x[i] / 7.385) + 3.3e4 * sin(0.71 * x[i]);
    }
    y[700] = NAN; /* breaks the polyline in two */
    hf_svg_axes a;
    assert_int_equal(hf_svg_axes_init(&a, 90, 80, 540, 340, -25, 25, -1.25e6, 1.25e6, 0, NULL),
                     HF_OK);
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_svg_begin(f, 700, 500, "t", 1);
    hf_svg_polyline(f, &a, x, 1, y, 1, N, hf_svg_colour(0), 2, "");
    hf_svg_end(f);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    long n0 = polyline_points(svg, NULL, 0, px, py, N);
    long n1 = polyline_points(svg, NULL, 1, px + 700, py + 700, N - 700);
    assert_int_equal(n0, 700);
    assert_int_equal(n1, N - 701);
    assert_int_equal(polyline_points(svg, NULL, 2, px, py, 0), -1);
    for (int i = 0; i < N; i++) {
        if (i == 700)
            continue;
        int k = i < 700 ? i : i - 1;
        double dx = hf_svg_axes_data_x(&a, px[k]), dy = hf_svg_axes_data_y(&a, py[k]);
        /* half a pixel in data units */
        assert_true(fabs(dx - x[i]) <= 0.5 * (a.xt.hi - a.xt.lo) / a.width);
        assert_true(fabs(dy - y[i]) <= 0.5 * (a.yt.hi - a.yt.lo) / a.height);
    }
    free(svg);
    fclose(f);
}

/* Dense data (185 points per pixel column) is reduced per column to its
 * first, lowest, highest and last points: every written point is a data
 * point (within half a pixel), in data order, and each column's drawn
 * extent equals the data's. */
static void test_polyline_dense_keeps_envelope(void **state)
{
    (void)state;
    enum { N = 100001 };
    static double x[N], y[N], px[N], py[N];
    for (int i = 0; i < N; i++) {
        x[i] = 3.5 + 0.00125 * i;
        y[i] = sin(x[i] * 0.71) + 0.3 * sin(x[i] * 377.0) + ((i % 9973) == 0 ? 2.5 : 0.0);
    }
    hf_svg_axes a;
    assert_int_equal(hf_svg_axes_init(&a, 90, 80, 540, 340, x[0], x[N - 1], -1.5, 3.9, 0, NULL),
                     HF_OK);
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_svg_begin(f, 700, 500, NULL, 1);
    hf_svg_polyline(f, &a, x, 1, y, 1, N, "#000000", 1, "");
    hf_svg_end(f);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    long m = polyline_points(svg, NULL, 0, px, py, N);
    assert_true(m > 540 && m <= 4 * 542);
    static double lo[700], hi[700], dlo[700], dhi[700];
    for (int c = 0; c < 700; c++) {
        lo[c] = dlo[c] = 1e9;
        hi[c] = dhi[c] = -1e9;
    }
    long prev = -1;
    double hx = 0.5 * (a.xt.hi - a.xt.lo) / a.width, hy = 0.5 * (a.yt.hi - a.yt.lo) / a.height;
    for (long k = 0; k < m; k++) {
        double xd = hf_svg_axes_data_x(&a, px[k]);
        long i = lround((xd - 3.5) / 0.00125);
        /* the written x may round onto a neighbour: look within 2 samples */
        long best = -1;
        double yd = hf_svg_axes_data_y(&a, py[k]), bd = INFINITY;
        for (long j = i - 2; j <= i + 2; j++)
            if (j >= 0 && j < N && fabs(x[j] - xd) <= hx && fabs(y[j] - yd) <= hy &&
                fabs(y[j] - yd) < bd) {
                best = j;
                bd = fabs(y[j] - yd);
            }
        assert_true(best >= 0);
        assert_true(best >= prev); /* data order */
        prev = best;
        int c = (int)floor(hf_svg_axes_px(&a, x[best]));
        lo[c] = fmin(lo[c], py[k]);
        hi[c] = fmax(hi[c], py[k]);
    }
    for (int i = 0; i < N; i++) {
        double q = hf_svg_axes_py(&a, y[i]);
        int c = (int)floor(hf_svg_axes_px(&a, x[i]));
        dlo[c] = fmin(dlo[c], q);
        dhi[c] = fmax(dhi[c], q);
    }
    for (int c = 0; c < 700; c++) {
        if (dlo[c] > 1e8)
            continue;
        assert_true(fabs(lo[c] - dlo[c]) <= 0.006 && fabs(hi[c] - dhi[c]) <= 0.006);
    }
    free(svg);
    fclose(f);
}

static void test_escape_and_text(void **state)
{
    (void)state;
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_svg_begin(f, 300, 200, "R&D <\"quoted\"> 'x'", 1);
    hf_svg_text(f, 10, 20, 's', 12, 0, 0, "a<b & c>d \x01\x7f tab\there");
    hf_svg_text(f, 10, 40, 'm', 12, 1, -90, "déjà vu, 30°");
    hf_svg_end(f);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, "<title>R&amp;D &lt;&quot;quoted&quot;&gt; &#39;x&#39;</title>"));
    assert_non_null(strstr(svg, ">a&lt;b &amp; c&gt;d ?? tab\there</text>"));
    assert_non_null(strstr(svg, "déjà vu, 30°"));
    free(svg);
    fclose(f);
}

/* Relative luminance, WCAG 2.0 (W3C 2008), definition of relative luminance. */
static double luminance(const char *hex)
{
    unsigned r, g, b;
    assert_int_equal(sscanf(hex, "#%2x%2x%2x", &r, &g, &b), 3);
    double c[3] = {r / 255.0, g / 255.0, b / 255.0};
    for (int i = 0; i < 3; i++)
        c[i] = c[i] <= 0.03928 ? c[i] / 12.92 : pow((c[i] + 0.055) / 1.055, 2.4);
    return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
}

static void test_palette(void **state)
{
    (void)state;
    /* Okabe & Ito (2008), Color Universal Design: the published hex values. */
    static const char *const oi[] = {"#e69f00", "#56b4e9", "#009e73", "#0072b2",
                                     "#d55e00", "#cc79a7", "#000000"};
    for (size_t i = 0; i < HF_SVG_NCOLOURS; i++) {
        int found = 0;
        for (size_t j = 0; j < 7; j++)
            found |= !strcmp(hf_svg_colour(i), oi[j]);
        assert_true(found);
        for (size_t j = 0; j < i; j++)
            assert_string_not_equal(hf_svg_colour(i), hf_svg_colour(j));
        /* visible on white: luminance contrast >= 1.5:1 (WCAG 2.0 ratio) */
        assert_true((1.05) / (luminance(hf_svg_colour(i)) + 0.05) >= 1.5);
    }
    assert_string_equal(hf_svg_colour(7), hf_svg_colour(0));
    assert_string_equal(hf_svg_dash(0), "");
    assert_string_not_equal(hf_svg_dash(7), "");
    assert_string_not_equal(hf_svg_dash(14), hf_svg_dash(7));
    /* the tension scale darkens monotonically (reads in grey-scale print) */
    char c0[8], c1[8];
    hf_svg_scale_colour(0.0, c0);
    for (int k = 1; k <= 50; k++) {
        hf_svg_scale_colour(k / 50.0, c1);
        assert_true(luminance(c1) < luminance(c0));
        strcpy(c0, c1);
    }
    hf_svg_scale_colour(NAN, c0);
    hf_svg_scale_colour(0.0, c1);
    assert_string_equal(c0, c1);
}

/* ---- figures ------------------------------------------------------------- */

/* A catenary-like profile (shape only; the numbers are a plotting fixture,
 * not a mooring result): 420 m on the seabed then a suspended part. */
static size_t make_profile(hf_line_point *p, size_t cap)
{
    size_t n = 0;
    for (int i = 0; i <= 60 && n < cap; i++, n++) {
        double s = 420.0 * i / 60;
        p[n] = (hf_line_point){s, s, 0.0, 180e3 + 95.0 * s};
    }
    double a = 1200.0; /* catenary parameter, m */
    for (int i = 1; i <= 120 && n < cap; i++, n++) {
        double u = 380.0 * i / 120;
        double x = 420.0 + u, z = a * (cosh(u / a) - 1.0);
        p[n] = (hf_line_point){420.0 + a * sinh(u / a), x, z, 220e3 + 1100.0 * z};
    }
    return n;
}

/* The k-th (0-based) <line> element with stroke `colour`, or NULL. */
static const char *find_line(const char *svg, const char *colour, int k)
{
    char b[32];
    for (const char *p = strstr(svg, "<line "); p; p = strstr(p + 1, "<line "))
        if (attr(p, "stroke", b, sizeof b) && !strcmp(b, colour) && k-- == 0)
            return p;
    return NULL;
}

/* The <text> element whose content is exactly s, or NULL. */
static const char *find_text(const char *svg, const char *s)
{
    size_t n = strlen(s);
    for (const char *p = strstr(svg, "<text "); p; p = strstr(p + 1, "<text ")) {
        const char *b = strchr(p, '>') + 1;
        if (!strncmp(b, s, n) && !strncmp(b + n, "</text>", 7))
            return p;
    }
    return NULL;
}

/* Number of occurrences of s in svg. */
static size_t count_of(const char *svg, const char *s)
{
    size_t k = 0;
    for (const char *p = strstr(svg, s); p; p = strstr(p + 1, s))
        k++;
    return k;
}

/* The box a text element covers, from its position, anchor and font size:
 * DejaVu Sans glyphs rise about 0.75 em above the baseline and descend
 * 0.25 em, and lower-case text averages about 0.55 em a character (a
 * generous estimate independent of svg.c's 0.62 em). */
typedef struct {
    double x0, y0, x1, y1;
} box;

static box text_box(const char *tag)
{
    char anchor[16];
    attr(tag, "text-anchor", anchor, sizeof anchor);
    double x = attr_num(tag, "x"), y = attr_num(tag, "y"), size = attr_num(tag, "font-size");
    const char *b = strchr(tag, '>') + 1;
    double w = 0.55 * size * (double)(strstr(b, "</text>") - b);
    double x0 = !strcmp(anchor, "end") ? x - w : !strcmp(anchor, "middle") ? x - 0.5 * w : x;
    return (box){x0, y - 0.75 * size, x0 + w, y + 0.25 * size};
}

/* 1 when the segment (x0, y0)-(x1, y1) passes through box b (sampled every
 * 0.25 px: a different method from svg.c's parametric clipping). */
static int seg_in_box(box b, double x0, double y0, double x1, double y1)
{
    int n = 1 + (int)(4 * hypot(x1 - x0, y1 - y0));
    for (int i = 0; i <= n; i++) {
        double x = x0 + (x1 - x0) * i / n, y = y0 + (y1 - y0) * i / n;
        if (x >= b.x0 && x <= b.x1 && y >= b.y0 && y <= b.y1)
            return 1;
    }
    return 0;
}

/* 1 when box b meets the horizontal rule drawn by <line> tag l. */
static int rule_in_box(box b, const char *l)
{
    return seg_in_box(b, attr_num(l, "x1"), attr_num(l, "y1"), attr_num(l, "x2"),
                      attr_num(l, "y2"));
}

/* 1 when box b meets any polyline that carries `must_have`. */
static int polylines_in_box(const char *svg, const char *must_have, box b)
{
    static double px[2048], py[2048];
    for (int k = 0;; k++) {
        long m = polyline_points(svg, must_have, k, px, py, 2048);
        if (m < 0)
            return 0;
        for (long i = 0; i + 1 < m && i + 1 < 2048; i++)
            if (seg_in_box(b, px[i], py[i], px[i + 1], py[i + 1]))
                return 1;
    }
}

/* Pixel distance between a plotted point and where the axis fits put the data. */
static double miss(const fit *fx, const fit *fy, double x, double y, double px, double py)
{
    return hypot(fit_px(fx, x) - px, fit_px(fy, y) - py);
}

static void test_figure_elevation(void **state)
{
    (void)state;
    hf_line_point pts[200];
    size_t n = make_profile(pts, 200);
    hf_svg_elevation e = {
        "Line \"bow-port\" & co <rest>", pts, n, 58.25, 1, 420.0, 640e3, 0, NULL, 0.0};
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_error err;
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, &err), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, "Line &quot;bow-port&quot; &amp; co &lt;rest&gt;"));
    assert_non_null(strstr(svg, ">still water level<"));
    assert_non_null(strstr(svg, ">touchdown<"));
    assert_non_null(strstr(svg, ">tension (kN)<"));
    assert_non_null(strstr(svg, "exaggerated"));
    /* Layout of svg.c: top panel 90,84 600x270; tension panel 90,430 600x170. */
    fit fx = axis_fit(svg, 1, 84 + 270 + 19, 0, 0);
    fit fz = axis_fit(svg, 0, 82, 80, 84 + 270 + 6);
    fit gx = axis_fit(svg, 1, 430 + 170 + 19, 0, 0);
    fit gt = axis_fit(svg, 0, 82, 426, 430 + 170 + 6);
    /* the allowed tension (640 kN, over twice the largest tension) is drawn:
     * a dashed reference line at its height across the panel */
    const char *al = find_line(svg, "#404040", 0);
    assert_non_null(al);
    assert_true(fabs(fit_px(&gt, 640.0) - attr_num(al, "y1")) <= 0.5);
    assert_true(fabs(fit_px(&gx, pts[0].x) - attr_num(al, "x1")) <= 0.5);
    assert_true(fabs(fit_px(&gx, pts[n - 1].x) - attr_num(al, "x2")) <= 0.5);
    assert_non_null(strstr(svg, ">allowed 640 kN<"));
    assert_non_null(strstr(svg, ">allowed tension<"));
    assert_null(strstr(svg, ">overloaded<")); /* no section data: nothing to flag */
    /* the line: coloured polylines (stroke width 3.5) joined end to end */
    static double px[400], py[400];
    size_t got = 0;
    for (int k = 0;; k++) {
        double qx[400], qy[400];
        long m = polyline_points(svg, "stroke-width=\"3.5\"", k, qx, qy, 400);
        if (m < 0)
            break;
        for (long i = got ? 1 : 0; i < m; i++) { /* joints are shared */
            assert_true(got < 400);
            px[got] = qx[i];
            py[got++] = qy[i];
        }
    }
    assert_int_equal(got, n);
    for (size_t i = 0; i < n; i++)
        assert_true(miss(&fx, &fz, pts[i].x, pts[i].z, px[i], py[i]) <= 0.5);
    /* tension panel, kN */
    long m = polyline_points(svg, "stroke=\"#000000\" stroke-width=\"2\"", 0, px, py, 400);
    assert_int_equal(m, (long)n);
    for (size_t i = 0; i < n; i++)
        assert_true(miss(&gx, &gt, pts[i].x, pts[i].tension / 1e3, px[i], py[i]) <= 0.5);
    /* fairlead circle and anchor square sit on the profile ends */
    const char *c = strstr(svg, "<circle ");
    assert_non_null(c);
    assert_true(miss(&fx, &fz, pts[n - 1].x, pts[n - 1].z, attr_num(c, "cx"), attr_num(c, "cy")) <=
                0.5);
    const char *r = strstr(svg, "<rect x=\"");
    while (r && attr_num(r, "width") != 11.0)
        r = strstr(r + 1, "<rect x=\"");
    assert_non_null(r);
    assert_true(
        miss(&fx, &fz, pts[0].x, pts[0].z, attr_num(r, "x") + 5.5, attr_num(r, "y") + 5.5) <= 0.5);
    free(svg);
    fclose(f);

    /* bad input is refused before anything is written */
    f = tmpfile();
    pts[7].z = NAN;
    hf_error_clear(&err);
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "point 7"));
    assert_int_equal(ftell(f), 0);
    pts[7].z = 0;
    e.water_height = 0;
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_EINVAL);
    e.water_height = 58.25;
    e.npts = 1;
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_EINVAL);
    assert_int_equal(ftell(f), 0);
    fclose(f);
}

static void test_figure_plan(void **state)
{
    (void)state;
    /* 12 lines in 4 groups of 3, anchors 850 m out, fairleads on a 90 x 40 m hull */
    enum { L = 12 };
    double anchor[L][2], fair[L][2];
    const char *names[L];
    char nb[L][40];
    unsigned char broken[L] = {0};
    broken[4] = 1;
    for (int i = 0; i < L; i++) {
        double ang = (45.0 + 90.0 * (i / 3) + 5.0 * (i % 3 - 1)) * M_PI / 180;
        double cx = (i / 3 == 0 || i / 3 == 3) ? 45 : -45, cy = (i / 3 < 2) ? 20 : -20;
        fair[i][0] = 103.7 + cx;
        fair[i][1] = -48.2 + cy;
        anchor[i][0] = fair[i][0] + 850 * cos(ang);
        anchor[i][1] = fair[i][1] + 850 * sin(ang);
        snprintf(nb[i], sizeof nb[i], "L%02d <g%d>", i + 1, i / 3);
        names[i] = nb[i];
    }
    hf_svg_plan p = {"Spread plan",
                     L,
                     names,
                     (const double(*)[2])anchor,
                     (const double(*)[2])fair,
                     broken,
                     0,
                     NULL,
                     {103.7, -48.2},
                     1,
                     30 * M_PI / 180,
                     "load: storm & swell",
                     1,
                     {100.2, -45.7},
                     NULL};
    FILE *f = tmpfile();
    assert_non_null(f);
    assert_int_equal(hf_svg_figure_plan(f, &p, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, "L01 &lt;g0&gt;"));
    assert_non_null(strstr(svg, "L05 &lt;g1&gt; (broken)"));
    assert_non_null(strstr(svg, "load: storm &amp; swell"));
    assert_non_null(strstr(svg, "drawn through the fairleads"));
    /* hull detail: offset from rest = |(103.7, -48.2) - (100.2, -45.7)| = 4.30 m */
    assert_non_null(strstr(svg, ">Hull detail<"));
    assert_non_null(strstr(svg, ">offset from rest 4.3 m<"));
    /* Equal scale: the axis fits have the same pixels per metre (y flipped). */
    fit fx = axis_fit(svg, 1, -1, 0, 0), fy = axis_fit(svg, 0, -1, 0, 0);
    assert_true(fabs(fx.b + fy.b) < 1e-6 * fabs(fx.b));
    /* anchors (10 px squares) and fairleads (r 3 circles), in line order */
    const char *q = svg;
    for (int i = 0; i < L; i++) {
        q = strstr(q, "<rect x=\"");
        while (q && attr_num(q, "width") != 10.0)
            q = strstr(q + 1, "<rect x=\"");
        assert_non_null(q);
        assert_true(miss(&fx, &fy, anchor[i][0], anchor[i][1], attr_num(q, "x") + 5,
                         attr_num(q, "y") + 5) <= 0.5);
        q = strstr(q, "<circle ");
        assert_non_null(q);
        assert_true(miss(&fx, &fy, fair[i][0], fair[i][1], attr_num(q, "cx"), attr_num(q, "cy")) <=
                    0.5);
    }
    /* the hull drawn through the fairleads passes through the outer ones */
    const char *h = strstr(svg, "stroke-dasharray=\"6 3\" points=\"");
    assert_non_null(h);
    free(svg);
    fclose(f);
}

static void test_figure_plan_outline_and_errors(void **state)
{
    (void)state;
    double anchor[3][2] = {{-500, 12.5}, {400, 300}, {400, -300}};
    double fair[3][2] = {{-20, 0}, {15, 8}, {15, -8}};
    double outline[5][2] = {{-25, -9}, {20, -9}, {28, 0}, {20, 9}, {-25, 9}};
    hf_svg_plan p = {"Three-line plan",
                     3,
                     NULL,
                     (const double(*)[2])anchor,
                     (const double(*)[2])fair,
                     NULL,
                     5,
                     (const double(*)[2])outline,
                     {0, 0},
                     0,
                     0,
                     NULL,
                     0,
                     {0, 0},
                     NULL};
    FILE *f = tmpfile();
    assert_non_null(f);
    assert_int_equal(hf_svg_figure_plan(f, &p, 0, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_null(strstr(svg, "<?xml")); /* inline form */
    assert_non_null(strstr(svg, ">line 2<"));
    assert_non_null(strstr(svg, "Grey: hull outline"));
    fit fx = axis_fit(svg, 1, -1, 0, 0), fy = axis_fit(svg, 0, -1, 0, 0);
    double qx[8], qy[8];
    const char *poly = strstr(svg, "<polygon fill=\"#e6e6e6\"");
    assert_non_null(poly);
    const char *pts = strstr(poly, "points=\"") + 8;
    for (int i = 0; i < 5; i++) {
        char *end;
        qx[i] = strtod(pts, &end);
        qy[i] = strtod(end + 1, &end);
        pts = end;
        assert_true(miss(&fx, &fy, outline[i][0], outline[i][1], qx[i], qy[i]) <= 0.5);
    }
    free(svg);
    fclose(f);
    f = tmpfile();
    anchor[1][0] = INFINITY;
    assert_int_equal(hf_svg_figure_plan(f, &p, 1, NULL), HF_EINVAL);
    anchor[1][0] = 400;
    p.noutline = 2;
    assert_int_equal(hf_svg_figure_plan(f, &p, 1, NULL), HF_EINVAL);
    p.noutline = 5;
    p.has_load = 1;
    p.load_direction = NAN;
    assert_int_equal(hf_svg_figure_plan(f, &p, 1, NULL), HF_EINVAL);
    assert_int_equal(ftell(f), 0);
    fclose(f);
}

static void test_figure_curve(void **state)
{
    (void)state;
    enum { N = 301, L = 9 };
    static double off[N], force[N], stiff[N], ten[N * L], util[N * L];
    const char *names[L];
    char nb[L][24];
    double lim[L];
    for (int j = 0; j < L; j++) {
        snprintf(nb[j], sizeof nb[j], "line-%d", j + 1);
        names[j] = nb[j];
        lim[j] = j < 6 ? 2.1e6 : 3.4e6;
    }
    for (int i = 0; i < N; i++) {
        off[i] = -30 + 60.0 * i / (N - 1);
        force[i] = -4.1e5 * sinh(off[i] / 17.3);
        stiff[i] = 4.1e5 / 17.3 * cosh(off[i] / 17.3);
        for (int j = 0; j < L; j++) {
            ten[i * L + j] = 8.5e5 * exp((j % 3 - 1) * off[i] / 25.0) * (1 + 0.05 * j);
            util[i * L + j] = ten[i * L + j] / (j < 6 ? 3.5e6 : 5.6e6);
        }
    }
    force[150] = NAN; /* a failed point: a gap, not a crash */
    hf_svg_curve c = {"Restoring curve", N, off, force, stiff, L, names, ten, util, 0.6, lim,
                      "direction 30 deg"};
    FILE *f = tmpfile();
    assert_non_null(f);
    assert_int_equal(hf_svg_figure_curve(f, &c, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    /* reference labels: on their line where a spot clear of the curves
     * exists, else under the panel ("dash-dot line: ...") */
    assert_non_null(strstr(svg, "limit 60 % (factor 1.67)<"));
    assert_non_null(strstr(svg, "allowed 2100 kN<"));
    assert_non_null(strstr(svg, "allowed 3400 kN<"));
    assert_non_null(strstr(svg, ">line-9<"));
    /* first panel (force): plot area 90,90 300x200, x labels at row 309;
     * the force series is split in two by the NaN */
    fit fx = axis_fit(svg, 1, 90 + 200 + 19, 80, 400);
    fit fy = axis_fit(svg, 0, 82, 86, 90 + 200 + 6);
    static double px[N], py[N];
    long m0 = polyline_points(svg, NULL, 0, px, py, N);
    assert_int_equal(m0, 150);
    for (int i = 0; i < 150; i++)
        assert_true(miss(&fx, &fy, off[i], force[i] / 1e3, px[i], py[i]) <= 0.5);
    long m1 = polyline_points(svg, NULL, 1, px, py, N);
    assert_int_equal(m1, N - 151);
    for (int i = 151; i < N; i++)
        assert_true(miss(&fx, &fy, off[i], force[i] / 1e3, px[i - 151], py[i - 151]) <= 0.5);
    free(svg);
    fclose(f);
    /* without stiffness and lines: one panel, still well formed */
    hf_svg_curve c1 = {"Force only", N, off, force, NULL, 0, NULL, NULL, NULL, 0, NULL, NULL};
    f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c1, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_null(strstr(svg, "Stiffness"));
    free(svg);
    fclose(f);
    c1.n = 1;
    f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c1, 1, NULL), HF_EINVAL);
    fclose(f);
}

static void test_figure_sweep(void **state)
{
    (void)state;
    enum { N = 11, C = 4 };
    double x[N], y[C * N];
    const char *names[C] = {"depth = 45 m", "depth = 55 m", "depth = 65 m", "depth = 75 m"};
    for (int i = 0; i < N; i++)
        x[i] = 300 + 25.0 * i;
    for (int c = 0; c < C; c++)
        for (int i = 0; i < N; i++)
            y[c * N + i] = 120.0 + 4.2 * c * c + 0.0031 * (x[i] - 300) * (x[i] - 300) / (c + 1);
    hf_svg_sweep s = {"Max tension vs pretension",
                      "pretension (kN)",
                      "max tension (kN)",
                      N,
                      C,
                      x,
                      y,
                      names,
                      "water depth",
                      1,
                      180.0,
                      "allowed 180 kN"};
    FILE *f = tmpfile();
    assert_non_null(f);
    assert_int_equal(hf_svg_figure_sweep(f, &s, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, ">depth = 75 m<"));
    assert_non_null(strstr(svg, ">water depth<"));
    fit fx = axis_fit(svg, 1, -1, 0, 0), fy = axis_fit(svg, 0, -1, 0, 0);
    for (int c = 0; c < C; c++) {
        double px[N], py[N];
        assert_int_equal(polyline_points(svg, NULL, c, px, py, N), N);
        for (int i = 0; i < N; i++)
            assert_true(miss(&fx, &fy, x[i], y[c * N + i], px[i], py[i]) <= 0.5);
    }
    free(svg);
    fclose(f);
    /* a single point on a single curve is still a figure (single-value axes) */
    hf_svg_sweep one = {"One", "x (m)", "y (N)", 1, 1, x, y, NULL, NULL, 0, 0, NULL};
    f = tmpfile();
    assert_int_equal(hf_svg_figure_sweep(f, &one, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    free(svg);
    fclose(f);
}

/* A fixture like a spread's weather line at rest (fictional numbers): the
 * fairlead 2.9 m below a 104.1 m still water level, so a label put just
 * above and left of it, as before issue 13, would sit on the water line. */
static size_t make_steep(hf_line_point *p, size_t cap)
{
    size_t n = 0;
    for (int i = 0; i <= 40 && n < cap; i++, n++) {
        double s = 300.0 * i / 40;
        p[n] = (hf_line_point){s, s, 0.0, 194e3 + 1150.0 * s};
    }
    double a = 900.0;
    for (int i = 1; i <= 120 && n < cap; i++, n++) {
        double u = 500.0 * i / 120;
        double x = 300.0 + u, z = a * (cosh(u / a) - 1.0) * 101.2 / (900.0 * (cosh(500.0 / a) - 1));
        p[n] = (hf_line_point){300.0 + a * sinh(u / a), x, z, 545e3 + 2300.0 * z};
    }
    return n;
}

/* Issue 13: the labels of the elevation sit on no other line (the still
 * water level, the seabed, the line itself). */
static void test_elevation_labels_clear(void **state)
{
    (void)state;
    static hf_line_point pts[200];
    size_t n = make_steep(pts, 200);
    assert_true(104.1 - pts[n - 1].z > 2.8 && 104.1 - pts[n - 1].z < 3.0);
    hf_svg_elevation e = {
        "Line weather-a (fictional)", pts, n, 104.1, 1, 300.0, 2.933e6, 0, NULL, 0.0};
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    const char *water = find_line(svg, "#0072b2", 0), *seabed = find_line(svg, "#8a7650", 0);
    assert_non_null(water);
    assert_non_null(seabed);
    static const char *const labels[] = {"fairlead", "touchdown", "anchor", "still water level",
                                         "seabed"};
    for (size_t i = 0; i < 5; i++) {
        const char *t = find_text(svg, labels[i]);
        assert_non_null(t);
        box b = text_box(t);
        if (i != 3 && rule_in_box(b, water)) {
            print_error("label '%s' sits on the still water level\n", labels[i]);
            fail();
        }
        if (i != 4 && rule_in_box(b, seabed)) {
            print_error("label '%s' sits on the seabed\n", labels[i]);
            fail();
        }
        if (polylines_in_box(svg, "stroke-width=\"3.5\"", b)) {
            print_error("label '%s' sits on the line\n", labels[i]);
            fail();
        }
    }
    /* labels never overlap one another */
    for (size_t i = 0; i < 5; i++)
        for (size_t j = i + 1; j < 5; j++) {
            box p = text_box(find_text(svg, labels[i])), q = text_box(find_text(svg, labels[j]));
            if (p.x0 < q.x1 && q.x0 < p.x1 && p.y0 < q.y1 && q.y0 < p.y1) {
                print_error("labels '%s' and '%s' overlap\n", labels[i], labels[j]);
                fail();
            }
        }
    /* the fairlead label stays next to its marker (within 60 px) */
    const char *c = strstr(svg, "<circle ");
    box fb = text_box(find_text(svg, "fairlead"));
    double cx = attr_num(c, "cx"), cy = attr_num(c, "cy");
    assert_true(fabs(0.5 * (fb.y0 + fb.y1) - cy) < 30 && fb.x1 <= cx && cx - fb.x1 < 60);
    free(svg);
    fclose(f);

    /* touchdown 60 m from the anchor (about 45 px): the two labels, placed
     * side by side as before, would overlap; they and the markers stay apart */
    e.touchdown_x = 60.0;
    f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    box an = text_box(find_text(svg, "anchor")), td = text_box(find_text(svg, "touchdown"));
    assert_false(an.x0 < td.x1 && td.x0 < an.x1 && an.y0 < td.y1 && td.y0 < an.y1);
    const char *tri = strstr(svg, "<polygon points=\"");
    assert_non_null(tri);
    /* first vertex: the top-left corner of the triangle's 12 px box */
    char *end;
    double tx = strtod(tri + 17, &end), ty = strtod(end + 1, NULL);
    assert_false(an.x0 < tx + 12 && tx < an.x1 && an.y0 < ty + 12 && ty < an.y1);
    free(svg);
    fclose(f);
}

/* Issue 13: each section's allowed tension is drawn as a step at its value
 * over the section's horizontal extent, and points with tension >= their
 * section's MBL are crossed on both panels with an "overloaded" key entry. */
static void test_elevation_sections_overload(void **state)
{
    (void)state;
    hf_line_point pts[200];
    size_t n = make_profile(pts, 200);
    /* make_profile: 420 m grounded (180-220 kN), then suspended to 287 kN.
     * Sections: chain to arc 300 m (MBL 2,385 kN, allowed 795 kN), a weak
     * insert to arc 600 m (MBL 225 kN, allowed 75 kN: its suspended points
     * above 225 kN are overloaded), chain to the end (MBL 2,385 kN). */
    hf_svg_section sec[3] = {{300, 2.385e6, 795e3}, {600, 225e3, 75e3}, {1e9, 2.385e6, 795e3}};
    hf_svg_elevation e = {"sections", pts, n, 58.25, 1, 420.0, 0, 3, sec, 0.0};
    size_t over = 0, first = 0;
    for (size_t i = 0; i < n; i++)
        if (pts[i].arc > 300 && pts[i].arc <= 600 && pts[i].tension >= 225e3 && !over++)
            first = i;
    assert_true(over >= 3); /* the fixture does overload the insert */
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    fit gx = axis_fit(svg, 1, 430 + 170 + 19, 0, 0);
    fit gt = axis_fit(svg, 0, 82, 426, 430 + 170 + 6);
    fit fx = axis_fit(svg, 1, 84 + 270 + 19, 0, 0);
    fit fz = axis_fit(svg, 0, 82, 80, 84 + 270 + 6);
    /* three steps: 795, 75, 795 kN; the middle one spans the insert's x */
    const char *s0 = find_line(svg, "#404040", 0), *s1 = find_line(svg, "#404040", 1);
    const char *s2 = find_line(svg, "#404040", 2);
    assert_non_null(s2);
    assert_true(fabs(attr_num(s0, "y1") - fit_px(&gt, 795)) <= 0.5);
    assert_true(fabs(attr_num(s1, "y1") - fit_px(&gt, 75)) <= 0.5);
    assert_true(fabs(attr_num(s2, "y1") - fit_px(&gt, 795)) <= 0.5);
    size_t a = 0, b = 0;
    for (size_t i = 0; i < n; i++) {
        if (pts[i].arc <= 300 + 1e-9)
            a = i + 1; /* first point of the insert */
        if (pts[i].arc <= 600 + 1e-9)
            b = i;
    }
    assert_true(fabs(attr_num(s1, "x1") - fit_px(&gx, pts[a].x)) <= 0.5);
    assert_true(fabs(attr_num(s1, "x2") - fit_px(&gx, pts[b].x)) <= 0.5);
    assert_non_null(strstr(svg, ">allowed 75 kN<"));
    /* crosses: a run of `over` points is marked at its first point and its
     * largest tension, on both panels: 2 x 2 marks, and one in the key; each
     * a halo and a stroke */
    assert_int_equal(count_of(svg, "<path d=\"M"), 2 * (4 + 1));
    assert_non_null(strstr(svg, ">overloaded<"));
    /* the first cross is centred on the first overloaded point (top panel) */
    const char *x = strstr(svg, "<path d=\"M");
    double x0 = strtod(x + 10, NULL);
    const char *sp = strchr(x + 10, ' ');
    double y0 = strtod(sp + 1, NULL);
    assert_true(miss(&fx, &fz, pts[first].x, pts[first].z, x0 + 5, y0 + 5) <= 0.5);
    free(svg);
    fclose(f);
    /* a stronger insert: nothing overloaded, no crosses, no key entry */
    sec[1].mbl = 2.385e6;
    f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    assert_null(strstr(svg, "<path d=\"M"));
    assert_null(strstr(svg, ">overloaded<"));
    free(svg);
    fclose(f);
    /* sections out of order or negative: refused before writing */
    f = tmpfile();
    sec[1].end_arc = 200;
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_EINVAL);
    sec[1].end_arc = 600;
    sec[2].allowed = -1;
    hf_error err;
    hf_error_clear(&err);
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "section 2"));
    assert_int_equal(ftell(f), 0);
    fclose(f);
}

/* Section records from a line: running ends, MBLs, MBL / factor. */
static void test_sections_from_line(void **state)
{
    (void)state;
    hf_line line;
    memset(&line, 0, sizeof line);
    line.n = 3;
    double len[3] = {275.5, 412.25, 96.75}, mbl[3] = {6.43e6, 4.85e6, 6.43e6};
    for (int i = 0; i < 3; i++) {
        line.sec[i].length = len[i];
        line.sec[i].mbl = mbl[i];
    }
    hf_svg_section sec[3];
    assert_int_equal(hf_svg_sections_from_line(&line, 1.67, NULL, 0), 3);
    assert_int_equal(hf_svg_sections_from_line(&line, 1.67, sec, 3), 3);
    assert_float_equal(sec[0].end_arc, 275.5, 1e-12);
    assert_float_equal(sec[1].end_arc, 687.75, 1e-12);
    assert_float_equal(sec[2].end_arc, 784.5, 1e-12);
    assert_float_equal(sec[1].mbl, 4.85e6, 0.0);
    assert_float_equal(sec[1].allowed, 4.85e6 / 1.67, 1e-6);
    assert_int_equal(hf_svg_sections_from_line(&line, 0.0, sec, 2), 3); /* no check: 0 */
    assert_float_equal(sec[0].allowed, 0.0, 0.0);
    assert_int_equal(hf_svg_sections_from_line(NULL, 1.67, sec, 3), 0);
}

/* Issue 13: identical lines share one elevation that names them all; all
 * lines overlaid in one elevation, each in its series style. */
static void test_elevation_group_and_overlay(void **state)
{
    (void)state;
    static hf_line_point p1[200], p2[200];
    size_t n1 = make_profile(p1, 200), n2 = make_steep(p2, 200);
    hf_svg_elevation e = {"Lines bow-a, bow-b", p1, n1, 58.25, 1, 420.0, 640e3, 0, NULL, 0.0};
    const char *names[3] = {"bow-a", "bow-b <port>", "stern-a"};
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation_group(f, &e, names, 2, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, "Drawn once for 2 lines of the same make-up and geometry: "
                                "bow-a, bow-b &lt;port&gt;<"));
    /* the panels moved down 16 px under the extra caption; data still exact */
    fit fx = axis_fit(svg, 1, 100 + 270 + 19, 0, 0);
    fit fz = axis_fit(svg, 0, 82, 96, 100 + 270 + 6);
    double px[400], py[400];
    long m = polyline_points(svg, "stroke-width=\"3.5\"", 0, px, py, 400);
    assert_true(m >= 2);
    assert_true(miss(&fx, &fz, p1[0].x, p1[0].z, px[0], py[0]) <= 0.5);
    free(svg);
    fclose(f);
    f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation_group(f, &e, names, 0, 1, NULL), HF_EINVAL);
    assert_int_equal(ftell(f), 0);
    fclose(f);

    hf_svg_elevation all[2] = {e, e};
    all[1].pts = p2;
    all[1].npts = n2;
    f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation_overlay(f, "All lines", all, names, 2, 1, NULL),
                     HF_OK);
    svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, ">bow-b &lt;port&gt;<"));
    assert_non_null(strstr(svg, ">fairlead<")); /* marker key */
    fx = axis_fit(svg, 1, 84 + 270 + 19, 0, 0);
    fz = axis_fit(svg, 0, 82, 80, 84 + 270 + 6);
    /* one polyline per line in its series colour, every point on the data */
    static double qx[400], qy[400];
    const hf_line_point *pp[2] = {p1, p2};
    size_t nn[2] = {n1, n2};
    for (int k = 0; k < 2; k++) {
        char want[64];
        snprintf(want, sizeof want, "stroke=\"%s\" stroke-width=\"2.5\"", hf_svg_colour((size_t)k));
        m = polyline_points(svg, want, 0, qx, qy, 400);
        assert_int_equal(m, (long)nn[k]);
        for (size_t i = 0; i < nn[k]; i++)
            assert_true(miss(&fx, &fz, pp[k][i].x, pp[k][i].z, qx[i], qy[i]) <= 0.5);
    }
    free(svg);
    fclose(f);
    /* a bad line is named in the message */
    all[1].water_height = NAN;
    hf_error err;
    hf_error_clear(&err);
    f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation_overlay(f, "x", all, NULL, 2, 1, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "line 2"));
    assert_int_equal(ftell(f), 0);
    fclose(f);
}

/* Issue 13: one convention for directions, 0-360 deg counter-clockwise
 * from x; angles reduced exactly in degrees. */
static void test_direction_label(void **state)
{
    (void)state;
    char b[32];
    static const struct {
        double rad;
        const char *want;
    } c[] = {
        {-M_PI / 2, "270 deg"}, {0.0, "0 deg"},
        {-0.0, "0 deg"},        {2 * M_PI, "0 deg"},
        {-2 * M_PI, "0 deg"},   {M_PI / 6, "30 deg"},
        {-M_PI / 6, "330 deg"}, {7 * M_PI / 2, "270 deg"},
        {-1e-12, "0 deg"},      {123.4 * M_PI / 180, "123.4 deg"},
    };
    for (size_t i = 0; i < sizeof c / sizeof c[0]; i++) {
        hf_svg_direction_label(c[i].rad, b, sizeof b);
        if (strcmp(b, c[i].want)) {
            print_error("%.17g rad: got '%s', expected '%s'\n", c[i].rad, b, c[i].want);
            fail();
        }
    }
    hf_svg_direction_label(NAN, b, sizeof b);
    assert_string_equal(b, "?");
    hf_svg_direction_label(INFINITY, b, sizeof b);
    assert_string_equal(b, "?");
}

/* Issue 13: the plan's key names every line with its style (the eighth
 * line repeats the first colour dashed), the load direction in the one
 * convention, and the scale bar lies outside the hull detail's frame, where
 * no line can cross it. */
static void test_plan_key_and_scale_bar(void **state)
{
    (void)state;
    enum { L = 8 };
    double anchor[L][2], fair[L][2];
    const char *names[L];
    char nb[L][24];
    for (int i = 0; i < L; i++) {
        double ang = (22.5 + 45.0 * i) * M_PI / 180;
        fair[i][0] = 55 * cos(ang);
        fair[i][1] = 18 * sin(ang);
        anchor[i][0] = 850 * cos(ang);
        anchor[i][1] = 850 * sin(ang);
        snprintf(nb[i], sizeof nb[i], "pt-%d", i + 1);
        names[i] = nb[i];
    }
    hf_svg_plan p = {"Plan",
                     L,
                     names,
                     (const double(*)[2])anchor,
                     (const double(*)[2])fair,
                     NULL,
                     0,
                     NULL,
                     {0, 0},
                     1,
                     -M_PI / 2,
                     "gale: 550 kN",
                     0,
                     {0, 0},
                     NULL};
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_plan(f, &p, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, ">load toward 270 deg<"));
    assert_non_null(strstr(svg, ">Lines<"));
    /* every line has a key entry: a sample in its colour and dash beside its name */
    for (int i = 0; i < L; i++) {
        const char *t = find_text(strstr(svg, ">Lines<"), names[i]); /* the key's, not the plan's */
        int found = 0;
        for (const char *q = strstr(svg, "<line "); q && !found; q = strstr(q + 1, "<line ")) {
            char col[16], dash[16] = "";
            attr(q, "stroke", col, sizeof col);
            attr(q, "stroke-dasharray", dash, sizeof dash);
            found = !strcmp(col, hf_svg_colour((size_t)i)) &&
                    !strcmp(dash, hf_svg_dash((size_t)i)) &&
                    fabs(attr_num(q, "x2") + 6 - attr_num(t, "x")) < 0.01 &&
                    fabs(attr_num(q, "y1") + 4 - attr_num(t, "y")) < 0.01;
        }
        if (!found) {
            print_error("no key entry for %s\n", names[i]);
            fail();
        }
    }
    assert_string_equal(hf_svg_dash(7), "7 4"); /* the eighth line is the dashed one */
    /* the scale bar (2.5 px black rule) lies below the hull detail's frame */
    const char *fr = strstr(svg, ">Hull detail<");
    assert_non_null(fr);
    fr = strstr(fr, "<rect ");
    double fb = attr_num(fr, "y") + attr_num(fr, "height");
    const char *sb = NULL;
    for (const char *q = strstr(svg, "<line "); q; q = strstr(q + 1, "<line ")) {
        char col[16], w[16];
        attr(q, "stroke", col, sizeof col);
        attr(q, "stroke-width", w, sizeof w);
        if (!strcmp(col, "#000000") && !strcmp(w, "2.5") && q > fr)
            sb = q;
    }
    assert_non_null(sb);
    assert_true(attr_num(sb, "y1") > fb + 4);
    free(svg);
    fclose(f);
}

/* Issue 13: overloaded points (utilisation >= 1) are crossed in the curve
 * figure's tension and utilisation panels, with an "overloaded" key entry. */
static void test_curve_overloads(void **state)
{
    (void)state;
    enum { N = 21, L = 2 };
    double off[N], force[N], ten[N * L], util[N * L];
    const char *names[L] = {"weather", "lee"};
    for (int i = 0; i < N; i++) {
        off[i] = 2.5 * i;
        force[i] = -3.1e4 * off[i];
        ten[i * L] = 4.2e5 + 9.6e4 * off[i];
        ten[i * L + 1] = 4.2e5 - 4.0e3 * off[i];
        util[i * L] = ten[i * L] / 3.75e6; /* >= 1 from offset 35 m: 7 points */
        util[i * L + 1] = ten[i * L + 1] / 3.75e6;
    }
    hf_svg_curve c = {"Overloads", N, off, force, NULL, L, names, ten, util, 0.6, NULL, NULL};
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    size_t over = 0;
    for (int i = 0; i < N; i++)
        over += util[i * L] >= 1.0;
    assert_int_equal(over, 7);
    /* n <= 60: every overloaded point, on two panels, and the key's cross;
     * halo + stroke each */
    assert_int_equal(count_of(svg, "<path d=\"M"), 2 * (2 * over + 1));
    assert_non_null(strstr(svg, ">overloaded<"));
    free(svg);
    fclose(f);
    for (int i = 0; i < N * L; i++)
        util[i] *= 0.5;
    f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    assert_null(strstr(svg, "<path d=\"M"));
    assert_null(strstr(svg, ">overloaded<"));
    free(svg);
    fclose(f);
}

/* Issue 13: a reference line's label sits on no curve: where the curves
 * pass the right end of the limit line the label moves along it; where they
 * leave no room at all it is written under the panel. */
static void test_curve_reference_labels_clear(void **state)
{
    (void)state;
    enum { N = 41, L = 2 };
    double off[N], force[N], ten[N * L], util[N * L];
    const char *names[L] = {"a", "b"};
    for (int i = 0; i < N; i++) {
        off[i] = -10 + 0.5 * i;
        force[i] = -2.385e4 * off[i];
        /* both lines cross the 50 % limit near the right end only */
        ten[i * L] = 1.2e6 + 1.1e5 * off[i];
        ten[i * L + 1] = 1.25e6 + 1.0e5 * off[i];
        util[i * L] = ten[i * L] / 3.6e6;
        util[i * L + 1] = ten[i * L + 1] / 3.6e6;
    }
    hf_svg_curve c = {"Labels", N, off, force, NULL, L, names, ten, util, 0.5, NULL, NULL};
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    const char *t = find_text(svg, "limit 50 % (factor 2)");
    assert_non_null(t);
    box b = text_box(t);
    assert_false(polylines_in_box(svg, "stroke-width=\"2\"", b));
    /* it stays on its line: within 20 px of the limit's row */
    const char *lim = find_line(svg, "#404040", 0);
    assert_non_null(lim);
    assert_true(fabs(attr_num(t, "y") - attr_num(lim, "y1")) <= 20);
    free(svg);
    fclose(f);
    /* curves everywhere around the limit: the label goes under the panel */
    for (int i = 0; i < N; i++) {
        util[i * L] = 0.5 + 0.4 * ((i % 2) ? 1 : -1);
        util[i * L + 1] = 0.5 - 0.4 * ((i % 2) ? 1 : -1);
    }
    f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    t = find_text(svg, "dash-dot line: limit 50 % (factor 2)");
    assert_non_null(t);
    assert_false(polylines_in_box(svg, "stroke-width=\"2\"", text_box(t)));
    free(svg);
    fclose(f);
}

/* Degenerate but valid inputs still give well-formed figures: a line
 * hanging straight down (one x value) with uniform tension, a flat curve, a
 * single-line plan with anchor and fairlead at the same x. */
static void test_figures_degenerate(void **state)
{
    (void)state;
    hf_line_point v[3] = {{0, 0, 0, 2385.0}, {5, 0, 5, 2385.0}, {10, 0, 10, 2385.0}};
    hf_svg_elevation e = {"hanging", v, 3, 12.5, 0, 0, 0, 0, NULL, 0.0};
    FILE *f = tmpfile();
    assert_int_equal(hf_svg_figure_elevation(f, &e, 1, NULL), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    free(svg);
    fclose(f);

    double off[4] = {-1, 0, 1, 2}, zero[4] = {0, 0, 0, 0}, t[4] = {5e5, 5e5, 5e5, 5e5};
    hf_svg_curve c = {"flat", 4, off, zero, zero, 1, NULL, t, zero, 0.5, NULL, NULL};
    f = tmpfile();
    assert_int_equal(hf_svg_figure_curve(f, &c, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    free(svg);
    fclose(f);

    double an[1][2] = {{0, -250}}, fl[1][2] = {{0, 0}};
    hf_svg_plan p = {NULL,
                     1,
                     NULL,
                     (const double(*)[2])an,
                     (const double(*)[2])fl,
                     NULL,
                     0,
                     NULL,
                     {0, 0},
                     1,
                     -M_PI / 2,
                     NULL,
                     0,
                     {0, 0},
                     NULL};
    f = tmpfile();
    assert_int_equal(hf_svg_figure_plan(f, &p, 1, NULL), HF_OK);
    svg = hf_test_stream_read(f, 1);
    hf_test_assert_xml(svg);
    assert_null(strstr(svg, "<title>")); /* no title given: none written */
    free(svg);
    fclose(f);
}

/* A sloped seabed (issue 15): the seabed rule runs through the anchor at the
 * slope (its two ends on z = x tan(slope) to half a pixel, by the axis fit);
 * slope 0 draws the flat seabed byte for byte. */
static void test_figure_elevation_sloped_seabed(void **state)
{
    (void)state;
    hf_line_point pts[200];
    size_t n = make_profile(pts, 200);
    hf_svg_elevation flat = {"Line s", pts, n, 58.25, 1, 420.0, 640e3, 0, NULL, 0.0};
    hf_svg_elevation zero = flat, up = flat;
    zero.seabed_slope = 0.0;
    up.seabed_slope = 0.0415;
    char *out[3];
    const hf_svg_elevation *es[3] = {&flat, &zero, &up};
    for (int k = 0; k < 3; k++) {
        FILE *f = tmpfile();
        assert_non_null(f);
        assert_int_equal(hf_svg_figure_elevation(f, es[k], 1, NULL), HF_OK);
        out[k] = hf_test_stream_read(f, 1);
        hf_test_assert_xml(out[k]);
    }
    assert_string_equal(out[0], out[1]);
    fit fx = axis_fit(out[2], 1, 84 + 270 + 19, 0, 0);
    fit fz = axis_fit(out[2], 0, 82, 80, 84 + 270 + 6);
    const char *sb = find_line(out[2], "#8a7650", 0); /* SEABED */
    assert_non_null(sb);
    double ts = tan(0.0415);
    double px1 = attr_num(sb, "x1"), py1 = attr_num(sb, "y1");
    double px2 = attr_num(sb, "x2"), py2 = attr_num(sb, "y2");
    double d1 = (px1 - fx.a) / fx.b, d2 = (px2 - fx.a) / fx.b; /* back to metres */
    assert_true(fabs(fit_px(&fz, d1 * ts) - py1) <= 0.5);
    assert_true(fabs(fit_px(&fz, d2 * ts) - py2) <= 0.5);
    assert_true(py2 < py1 - 5); /* rising toward the fairlead */
    assert_non_null(strstr(out[2], "<polygon points="));
    for (int k = 0; k < 3; k++)
        free(out[k]);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_xml_checker_rejects),
        cmocka_unit_test(test_ticks_awkward_ranges),
        cmocka_unit_test(test_ticks_exact_choices),
        cmocka_unit_test(test_ticks_reject_nonfinite),
        cmocka_unit_test(test_axes_mapping_round_trip),
        cmocka_unit_test(test_axes_x_labels_fit),
        cmocka_unit_test(test_polyline_points_within_half_pixel),
        cmocka_unit_test(test_polyline_dense_keeps_envelope),
        cmocka_unit_test(test_escape_and_text),
        cmocka_unit_test(test_palette),
        cmocka_unit_test(test_figure_elevation),
        cmocka_unit_test(test_figure_elevation_sloped_seabed),
        cmocka_unit_test(test_figure_plan),
        cmocka_unit_test(test_figure_plan_outline_and_errors),
        cmocka_unit_test(test_figure_curve),
        cmocka_unit_test(test_figure_sweep),
        cmocka_unit_test(test_figures_degenerate),
        cmocka_unit_test(test_elevation_labels_clear),
        cmocka_unit_test(test_elevation_sections_overload),
        cmocka_unit_test(test_elevation_group_and_overlay),
        cmocka_unit_test(test_sections_from_line),
        cmocka_unit_test(test_direction_label),
        cmocka_unit_test(test_plan_key_and_scale_bar),
        cmocka_unit_test(test_curve_overloads),
        cmocka_unit_test(test_curve_reference_labels_clear),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
