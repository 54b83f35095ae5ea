/* svg.c - holdfast's plotting library: ticks, axes, primitives, and the four figures. */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/svg.h"

/* ---- look ------------------------------------------------------------- */

#define FONT "DejaVu Sans, Verdana, Helvetica, Arial, sans-serif"
#define INK "#000000"    /* all text and rules */
#define GRID "#c8c8c8"   /* dotted grid */
#define SEABED "#8a7650" /* seabed rule */
#define SEABED_FILL "#efe9dc"
#define WATER "#0072b2"   /* still water level, dashed */
#define REFLINE "#404040" /* criterion limits */
#define HULL_FILL "#e6e6e6"
#define TICK_PX 12.0
#define LABEL_PX 13.0
#define TITLE_PX 15.0

/* Okabe & Ito (2008), Color Universal Design: the seven colours that show on
 * white (yellow #f0e442 left out), ordered for contrast between neighbours. */
static const char *const palette[HF_SVG_NCOLOURS] = {
    "#0072b2", /* blue */
    "#d55e00", /* vermilion */
    "#009e73", /* bluish green */
    "#cc79a7", /* reddish purple */
    "#e69f00", /* orange */
    "#56b4e9", /* sky blue */
    "#000000", /* black */
};

const char *hf_svg_colour(size_t i)
{
    return palette[i % HF_SVG_NCOLOURS];
}

const char *hf_svg_dash(size_t i)
{
    static const char *const dash[3] = {"", "7 4", "2 3"};
    return dash[(i / HF_SVG_NCOLOURS) % 3];
}

void hf_svg_scale_colour(double t, char buf[8])
{
    /* Stops of our tension scale: light amber -> Okabe-Ito vermilion -> dark
     * brown; CIE lightness about 80 -> 55 -> 22, falling monotonically. */
    static const double stop[3][3] = {{245, 190, 80}, {213, 94, 0}, {90, 30, 10}};
    if (!(t > 0.0))
        t = 0.0;
    if (t > 1.0)
        t = 1.0;
    double u = t * 2.0;
    int k = u >= 1.0 ? 1 : 0;
    double f = u - k;
    int c[3];
    for (int i = 0; i < 3; i++)
        c[i] = (int)lround(stop[k][i] + f * (stop[k + 1][i] - stop[k][i]));
    snprintf(buf, 8, "#%02x%02x%02x", c[0] & 255, c[1] & 255, c[2] & 255);
}

/* ---- fast fixed-point coordinates ------------------------------------- */

/* Writes v with exactly two decimals ("-12.35"); |v| < 1e15 assumed (pixel
 * coordinates; callers clamp).  Returns the length.  printf would be the
 * bottleneck of a 10,001-point curve. */
static size_t fix2(char *buf, double v)
{
    char t[24];
    size_t n = 0, k = 0;
    if (!(v > -1e15 && v < 1e15))
        v = 0.0;
    long long q = llround(v * 100.0);
    if (q < 0) {
        buf[n++] = '-';
        q = -q;
    }
    do {
        t[k++] = (char)('0' + q % 10);
        q /= 10;
    } while (q > 0 || k < 3);
    while (k > 2)
        buf[n++] = t[--k];
    buf[n++] = '.';
    buf[n++] = t[1];
    buf[n++] = t[0];
    buf[n] = '\0';
    return n;
}

static void putnum(FILE *out, double v)
{
    char b[32];
    fwrite(b, 1, fix2(b, v), out);
}

/* Clamps a pixel coordinate to a sane band around the figure, so data far
 * outside the axes (a caller's limit line, say) cannot make absurd numbers. */
static double clampp(double p)
{
    return p < -1e6 ? -1e6 : p > 1e6 ? 1e6 : p;
}

/* ---- text --------------------------------------------------------------- */

void hf_svg_escape(FILE *out, const char *s)
{
    if (!s)
        return;
    for (; *s; s++) {
        unsigned char ch = (unsigned char)*s;
        switch (ch) {
        case '&':
            fputs("&amp;", out);
            break;
        case '<':
            fputs("&lt;", out);
            break;
        case '>':
            fputs("&gt;", out);
            break;
        case '"':
            fputs("&quot;", out);
            break;
        case '\'':
            fputs("&#39;", out);
            break;
        default:
            /* XML 1.0 section 2.2: only tab, LF, CR are allowed below 0x20. */
            if (ch < 0x20 && ch != '\t' && ch != '\n' && ch != '\r')
                putc('?', out);
            else if (ch == 0x7f)
                putc('?', out);
            else
                putc(ch, out);
        }
    }
}

/* Text, optionally with a white halo (paint-order stroke) so a label stays
 * readable where it crosses a line. */
static void text_ex(FILE *out, double x, double y, char anchor, double size, int bold,
                    double rotate, int halo, const char *text)
{
    const char *a = anchor == 'm' ? "middle" : anchor == 'e' ? "end" : "start";
    fputs("<text x=\"", out);
    putnum(out, clampp(x));
    fputs("\" y=\"", out);
    putnum(out, clampp(y));
    fprintf(out, "\" font-size=\"%g\" text-anchor=\"%s\"", size, a);
    if (bold)
        fputs(" font-weight=\"bold\"", out);
    if (halo)
        fputs(" stroke=\"#ffffff\" stroke-width=\"4\" stroke-linejoin=\"round\" "
              "paint-order=\"stroke\"",
              out);
    if (rotate != 0.0) {
        fprintf(out, " transform=\"rotate(%g ", rotate);
        putnum(out, clampp(x));
        putc(' ', out);
        putnum(out, clampp(y));
        fputs(")\"", out);
    }
    putc('>', out);
    hf_svg_escape(out, text);
    fputs("</text>\n", out);
}

void hf_svg_text(FILE *out, double x, double y, char anchor, double size, int bold, double rotate,
                 const char *text)
{
    text_ex(out, x, y, anchor, size, bold, rotate, 0, text);
}

/* ---- ticks -------------------------------------------------------------- */

hf_status hf_svg_ticks_choose(double lo, double hi, int target, hf_svg_ticks *t, hf_error *err)
{
    if (!isfinite(lo) || !isfinite(hi) || fabs(lo) > 1e300 || fabs(hi) > 1e300)
        return hf_error_set(err, HF_EINVAL,
                            "plot axis range %g..%g: expected finite values within +-1e300", lo,
                            hi);
    if (target < 2)
        target = 2;
    if (target > 12)
        target = 12;
    if (lo > hi) {
        double s = lo;
        lo = hi;
        hi = s;
    }
    double mag = fmax(fabs(lo), fabs(hi));
    if (mag < 1e-300) { /* zero, or too small to tell from zero: a unit range */
        lo = -1.0;
        hi = 1.0;
    } else if (hi - lo <= 1e-9 * mag) { /* a single value: +-10 % around it */
        double c = 0.5 * (lo + hi), pad = 0.1 * fabs(c);
        lo = c - pad;
        hi = c + pad;
    }
    /* Candidates: the three smallest 1-2-5 steps not below span / (target +
     * 2).  Among those giving at most target + 2 intervals, the one whose
     * widened range wastes least wins; on a tie, the interval count nearest
     * the target. */
    double raw = (hi - lo) / (target + 2);
    double base = pow(10.0, floor(log10(raw)));
    static const double mult[] = {1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0};
    int found = 0, tried = 0;
    double best_cover = 0, best_dist = 0;
    for (size_t m = 0; m < sizeof mult / sizeof mult[0] && tried < 3; m++) {
        double step = mult[m] * base;
        if (step < raw * (1.0 - 1e-12))
            continue;
        tried++;
        /* a data end within 1e-6 of a step past a tick is on that tick */
        double f = floor(lo / step + 1e-6), l = ceil(hi / step - 1e-6);
        if (l <= f)
            l = f + 1.0;
        if (l - f > target + 2 || l - f + 1.0 > HF_SVG_MAX_TICKS)
            continue;
        double cover = (l - f) * step, dist = fabs((l - f) - target);
        if (found && (cover > best_cover * (1 + 1e-9) ||
                      (cover > best_cover * (1 - 1e-9) && dist >= best_dist)))
            continue;
        found = 1;
        best_cover = cover;
        best_dist = dist;
        t->step = step;
        t->first = (long)f;
        t->n = (size_t)(l - f) + 1;
        t->lo = f * step;
        t->hi = l * step;
    }
    if (found)
        return HF_OK;
    /* Not reached: the third candidate always gives <= target + 2 intervals. */
    return hf_error_set(err, HF_EINVAL, "plot axis range %g..%g: no tick step found", lo, hi);
}

double hf_svg_tick_value(const hf_svg_ticks *t, size_t i)
{
    double v = (double)(t->first + (long)i) * t->step;
    return v == 0.0 ? 0.0 : v;
}

void hf_svg_tick_label(const hf_svg_ticks *t, size_t i, char *buf, size_t cap)
{
    double v = hf_svg_tick_value(t, i);
    double mag = fmax(fabs(t->lo), fabs(t->hi));
    int s = (int)floor(log10(t->step) + 1e-9); /* decimal position of the step */
    if (v == 0.0) {
        snprintf(buf, cap, "0");
        return;
    }
    if (t->step >= 1e-4 && mag < 1e7) {
        snprintf(buf, cap, "%.*f", s < 0 ? -s : 0, v);
        return;
    }
    int e = (int)floor(log10(fabs(v)) + 1e-12);
    int p = e - s > 0 ? e - s : 0;
    if (p > 15)
        p = 15;
    char tmp[64];
    snprintf(tmp, sizeof tmp, "%.*e", p, v);
    /* Compact: drop trailing mantissa zeros, '+' and leading exponent zeros. */
    char *ep = strchr(tmp, 'e');
    char mant[40], expo[16];
    size_t ml = (size_t)(ep - tmp);
    memcpy(mant, tmp, ml);
    mant[ml] = '\0';
    if (strchr(mant, '.')) {
        while (ml > 0 && mant[ml - 1] == '0')
            mant[--ml] = '\0';
        if (ml > 0 && mant[ml - 1] == '.')
            mant[--ml] = '\0';
    }
    int x = (int)strtol(ep + 1, NULL, 10);
    snprintf(expo, sizeof expo, "%d", x);
    snprintf(buf, cap, "%se%s", mant, expo);
}

/* ---- axes --------------------------------------------------------------- */

hf_status hf_svg_axes_init(hf_svg_axes *a, double left, double top, double width, double height,
                           double x0, double x1, double y0, double y1, int equal, hf_error *err)
{
    if (!isfinite(left) || !isfinite(top) || !(width > 0.0) || !(height > 0.0) ||
        !isfinite(width) || !isfinite(height))
        return hf_error_set(err, HF_EINVAL, "plot area %g x %g px: expected positive sizes", width,
                            height);
    int tx = width >= 400 ? 8 : width >= 250 ? 6 : 4;
    int ty = height >= 300 ? 8 : height >= 180 ? 5 : 4;
    hf_status s = hf_svg_ticks_choose(y0, y1, ty, &a->yt, err);
    if (s != HF_OK)
        return s;
    /* x: fewer intervals until the widest label (about 0.62 em a
     * character) fits between neighbouring ticks with 10 px to spare */
    for (;; tx--) {
        s = hf_svg_ticks_choose(x0, x1, tx, &a->xt, err);
        if (s != HF_OK)
            return s;
        size_t wmax = 1;
        char lab[64];
        for (size_t i = 0; i < a->xt.n; i++) {
            hf_svg_tick_label(&a->xt, i, lab, sizeof lab);
            if (strlen(lab) > wmax)
                wmax = strlen(lab);
        }
        double gap = width / (double)(a->xt.n - 1);
        if (tx <= 2 || gap >= 0.62 * TICK_PX * (double)wmax + 10)
            break;
    }
    if (equal) {
        /* One data unit = the same pixels both ways: shrink and centre. */
        double sx = width / (a->xt.hi - a->xt.lo), sy = height / (a->yt.hi - a->yt.lo);
        double sc = fmin(sx, sy);
        double w = sc * (a->xt.hi - a->xt.lo), h = sc * (a->yt.hi - a->yt.lo);
        left += 0.5 * (width - w);
        top += 0.5 * (height - h);
        width = w;
        height = h;
    }
    a->left = left;
    a->top = top;
    a->width = width;
    a->height = height;
    return HF_OK;
}

double hf_svg_axes_px(const hf_svg_axes *a, double x)
{
    return a->left + (x - a->xt.lo) / (a->xt.hi - a->xt.lo) * a->width;
}

double hf_svg_axes_py(const hf_svg_axes *a, double y)
{
    return a->top + a->height - (y - a->yt.lo) / (a->yt.hi - a->yt.lo) * a->height;
}

double hf_svg_axes_data_x(const hf_svg_axes *a, double px)
{
    return a->xt.lo + (px - a->left) / a->width * (a->xt.hi - a->xt.lo);
}

double hf_svg_axes_data_y(const hf_svg_axes *a, double py)
{
    return a->yt.lo + (a->top + a->height - py) / a->height * (a->yt.hi - a->yt.lo);
}

/* ---- primitives ----------------------------------------------------------- */

void hf_svg_begin(FILE *out, double width, double height, const char *title, int standalone)
{
    if (standalone)
        fputs("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n", out);
    fprintf(out,
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%g\" height=\"%g\" "
            "viewBox=\"0 0 %g %g\" font-family=\"%s\" fill=\"" INK "\">\n",
            width, height, width, height, FONT);
    if (title) {
        fputs("<title>", out);
        hf_svg_escape(out, title);
        fputs("</title>\n", out);
    }
    fprintf(out, "<rect x=\"0\" y=\"0\" width=\"%g\" height=\"%g\" fill=\"#ffffff\"/>\n", width,
            height);
}

void hf_svg_end(FILE *out)
{
    fputs("</svg>\n", out);
}

static void seg(FILE *out, double x0, double y0, double x1, double y1, const char *stroke,
                double width, const char *dash)
{
    fputs("<line x1=\"", out);
    putnum(out, clampp(x0));
    fputs("\" y1=\"", out);
    putnum(out, clampp(y0));
    fputs("\" x2=\"", out);
    putnum(out, clampp(x1));
    fputs("\" y2=\"", out);
    putnum(out, clampp(y1));
    fprintf(out, "\" stroke=\"%s\" stroke-width=\"%g\"", stroke, width);
    if (dash && *dash)
        fprintf(out, " stroke-dasharray=\"%s\"", dash);
    fputs("/>\n", out);
}

void hf_svg_axes_draw(FILE *out, const hf_svg_axes *a, const char *xlabel, const char *ylabel,
                      const char *title)
{
    char lab[64];
    double bottom = a->top + a->height, right = a->left + a->width;
    fputs("<g>\n", out);
    /* grid */
    for (size_t i = 0; i < a->xt.n; i++) {
        double px = hf_svg_axes_px(a, hf_svg_tick_value(&a->xt, i));
        if (i > 0)
            seg(out, px, a->top, px, bottom, GRID, 0.8, "1 3");
    }
    for (size_t i = 0; i < a->yt.n; i++) {
        double py = hf_svg_axes_py(a, hf_svg_tick_value(&a->yt, i));
        if (i > 0)
            seg(out, a->left, py, right, py, GRID, 0.8, "1 3");
    }
    /* open frame: left and bottom rules, outward ticks */
    seg(out, a->left, a->top, a->left, bottom, INK, 1.2, "");
    seg(out, a->left, bottom, right, bottom, INK, 1.2, "");
    size_t ylen = 1;
    for (size_t i = 0; i < a->xt.n; i++) {
        double px = hf_svg_axes_px(a, hf_svg_tick_value(&a->xt, i));
        seg(out, px, bottom, px, bottom + 5, INK, 1.2, "");
        hf_svg_tick_label(&a->xt, i, lab, sizeof lab);
        hf_svg_text(out, px, bottom + 19, 'm', TICK_PX, 0, 0, lab);
    }
    for (size_t i = 0; i < a->yt.n; i++) {
        double py = hf_svg_axes_py(a, hf_svg_tick_value(&a->yt, i));
        seg(out, a->left - 5, py, a->left, py, INK, 1.2, "");
        hf_svg_tick_label(&a->yt, i, lab, sizeof lab);
        if (strlen(lab) > ylen)
            ylen = strlen(lab);
        hf_svg_text(out, a->left - 8, py + 4, 'e', TICK_PX, 0, 0, lab);
    }
    if (xlabel)
        hf_svg_text(out, a->left + 0.5 * a->width, bottom + 40, 'm', LABEL_PX, 0, 0, xlabel);
    if (ylabel) {
        /* clear of the widest tick label (about 0.62 em per character) */
        double x = a->left - 14 - 0.62 * TICK_PX * (double)ylen - 8;
        if (x < 14)
            x = 14;
        hf_svg_text(out, x, a->top + 0.5 * a->height, 'm', LABEL_PX, 0, -90, ylabel);
    }
    if (title)
        hf_svg_text(out, a->left, a->top - 12, 's', LABEL_PX, 1, 0, title);
    fputs("</g>\n", out);
}

/* A polyline being written: opened lazily, broken at gaps, and, for dense
 * data, reduced per pixel column to the first, lowest, highest and last
 * points in data order (the M4 aggregation of Jugel et al. (2014), "M4: a
 * visualization-oriented time series data aggregation", PVLDB 7(10)), which
 * draws the same pixels as the full series with at most four points per
 * column.  Every written point is a data point. */
typedef struct {
    FILE *out;
    const char *colour, *dash;
    double width;
    int open;
    int dense;     /* 1: aggregate per pixel column */
    long col;      /* current pixel column (dense) */
    int have;      /* points held for the current column */
    size_t idx[4]; /* first, min, max, last: data indices */
    double px[4], py[4];
} pline;

static void pl_point(pline *l, double px, double py)
{
    char b[32];
    if (!l->open) {
        fprintf(l->out,
                "<polyline fill=\"none\" stroke=\"%s\" stroke-width=\"%g\" "
                "stroke-linejoin=\"round\" stroke-linecap=\"round\"",
                l->colour, l->width);
        if (l->dash && *l->dash)
            fprintf(l->out, " stroke-dasharray=\"%s\"", l->dash);
        fputs(" points=\"", l->out);
        l->open = 1;
    } else {
        putc(' ', l->out);
    }
    fwrite(b, 1, fix2(b, clampp(px)), l->out);
    putc(',', l->out);
    fwrite(b, 1, fix2(b, clampp(py)), l->out);
}

/* Writes the held points of the current column in data order, once each. */
static void pl_flush(pline *l)
{
    if (!l->have)
        return;
    int ord[4] = {0, 1, 2, 3};
    for (int i = 1; i < 4; i++) /* insertion sort by data index */
        for (int j = i; j > 0 && l->idx[ord[j]] < l->idx[ord[j - 1]]; j--) {
            int t = ord[j];
            ord[j] = ord[j - 1];
            ord[j - 1] = t;
        }
    for (int k = 0; k < 4; k++)
        if (k == 0 || l->idx[ord[k]] != l->idx[ord[k - 1]])
            pl_point(l, l->px[ord[k]], l->py[ord[k]]);
    l->have = 0;
}

static void pl_close(pline *l)
{
    pl_flush(l);
    if (l->open)
        fputs("\"/>\n", l->out);
    l->open = 0;
}

static void pl_add(pline *l, size_t i, double px, double py)
{
    if (!l->dense) {
        pl_point(l, px, py);
        return;
    }
    long c = (long)floor(px);
    if (l->have && c != l->col)
        pl_flush(l);
    if (!l->have) {
        l->col = c;
        l->have = 1;
        for (int k = 0; k < 4; k++) {
            l->idx[k] = i;
            l->px[k] = px;
            l->py[k] = py;
        }
        return;
    }
    /* pixel rows grow downward: the lowest value has the largest py */
    if (py > l->py[1]) {
        l->idx[1] = i;
        l->px[1] = px;
        l->py[1] = py;
    }
    if (py < l->py[2]) {
        l->idx[2] = i;
        l->px[2] = px;
        l->py[2] = py;
    }
    l->idx[3] = i;
    l->px[3] = px;
    l->py[3] = py;
}

/* The shared series writer: n points (x[i*xs], scale * y[i*ys]). */
static void series(FILE *out, const hf_svg_axes *a, const double *x, size_t xs, const double *y,
                   size_t ys, size_t n, double scale, const char *colour, double width,
                   const char *dash)
{
    pline l = {out, colour, dash, width, 0, 0, 0, 0, {0}, {0}, {0}};
    /* dense when there are more than four points per pixel column */
    l.dense = (double)n > 4.0 * a->width;
    for (size_t i = 0; i < n; i++) {
        double xv = x[i * xs], yv = y[i * ys] * scale;
        if (!isfinite(xv) || !isfinite(yv)) {
            pl_close(&l);
            continue;
        }
        pl_add(&l, i, hf_svg_axes_px(a, xv), hf_svg_axes_py(a, yv));
    }
    pl_close(&l);
}

void hf_svg_polyline(FILE *out, const hf_svg_axes *a, const double *x, size_t xstride,
                     const double *y, size_t ystride, size_t n, const char *colour, double width,
                     const char *dash)
{
    series(out, a, x, xstride ? xstride : 1, y, ystride ? ystride : 1, n, 1.0, colour, width, dash);
}

/* A marker centred on pixel (px, py). */
static void mark(FILE *out, double px, double py, hf_svg_shape shape, double size, const char *fill)
{
    double r = 0.5 * size;
    px = clampp(px);
    py = clampp(py);
    switch (shape) {
    case HF_SVG_SQUARE:
        fputs("<rect x=\"", out);
        putnum(out, px - r);
        fputs("\" y=\"", out);
        putnum(out, py - r);
        fputs("\" width=\"", out);
        putnum(out, size);
        fputs("\" height=\"", out);
        putnum(out, size);
        break;
    case HF_SVG_TRIANGLE:
    case HF_SVG_DIAMOND:
        fputs("<polygon points=\"", out);
        if (shape == HF_SVG_TRIANGLE) {
            putnum(out, px - r);
            putc(',', out);
            putnum(out, py - r);
            putc(' ', out);
            putnum(out, px + r);
            putc(',', out);
            putnum(out, py - r);
            putc(' ', out);
            putnum(out, px);
            putc(',', out);
            putnum(out, py + r);
        } else {
            putnum(out, px);
            putc(',', out);
            putnum(out, py - r);
            putc(' ', out);
            putnum(out, px + r);
            putc(',', out);
            putnum(out, py);
            putc(' ', out);
            putnum(out, px);
            putc(',', out);
            putnum(out, py + r);
            putc(' ', out);
            putnum(out, px - r);
            putc(',', out);
            putnum(out, py);
        }
        break;
    case HF_SVG_CIRCLE:
    default:
        fputs("<circle cx=\"", out);
        putnum(out, px);
        fputs("\" cy=\"", out);
        putnum(out, py);
        fputs("\" r=\"", out);
        putnum(out, r);
        break;
    }
    fprintf(out, "\" fill=\"%s\" stroke=\"" INK "\" stroke-width=\"1.2\"/>\n", fill);
}

void hf_svg_marker(FILE *out, const hf_svg_axes *a, double x, double y, hf_svg_shape shape,
                   double size, const char *fill, const char *label, double dx, double dy)
{
    if (!isfinite(x) || !isfinite(y))
        return;
    double px = hf_svg_axes_px(a, x), py = hf_svg_axes_py(a, y);
    mark(out, px, py, shape, size, fill);
    if (label)
        text_ex(out, px + dx, py + dy, dx < 0 ? 'e' : dx > 0 ? 's' : 'm', TICK_PX, 0, 0, 1, label);
}

void hf_svg_hline(FILE *out, const hf_svg_axes *a, double y, const char *label)
{
    if (!isfinite(y))
        return;
    double py = hf_svg_axes_py(a, y);
    seg(out, a->left, py, a->left + a->width, py, REFLINE, 1.5, "8 3 2 3");
    if (label)
        text_ex(out, a->left + a->width - 4, py - 5, 'e', TICK_PX, 0, 0, 1, label);
}

void hf_svg_legend(FILE *out, double x, double y, const char *const *names, const size_t *style,
                   size_t n)
{
    fputs("<g>\n", out);
    for (size_t i = 0; i < n; i++) {
        size_t st = style ? style[i] : i;
        double yy = y + 18.0 * (double)i;
        seg(out, x, yy + 9, x + 26, yy + 9, hf_svg_colour(st), 2.5, hf_svg_dash(st));
        hf_svg_text(out, x + 32, yy + 13, 's', TICK_PX, 0, 0, names ? names[i] : NULL);
    }
    fputs("</g>\n", out);
}

/* ---- figure helpers ----------------------------------------------------- */

/* Text at (x, y), anchored at its start, shortened with "..." to fit the
 * width from x to `right` - 20 px (DejaVu Sans averages under 0.62 em a
 * character); the cut never splits a UTF-8 sequence. */
static void clipped(FILE *out, double x, double y, double size, int bold, double right,
                    const char *text)
{
    char buf[512];
    size_t max = (size_t)((right - x - 20) / (0.62 * size));
    if (!text)
        return;
    if (max > sizeof buf - 4)
        max = sizeof buf - 4;
    if (max < 4)
        max = 4;
    size_t n = strlen(text);
    if (n <= max) {
        hf_svg_text(out, x, y, 's', size, bold, 0, text);
        return;
    }
    n = max - 3;
    while (n > 0 && ((unsigned char)text[n] & 0xC0) == 0x80)
        n--;
    memcpy(buf, text, n);
    memcpy(buf + n, "...", 4);
    hf_svg_text(out, x, y, 's', size, bold, 0, buf);
}

/* The figure title at the top left, shortened to the figure's width. */
static void title(FILE *out, double width, const char *text)
{
    clipped(out, 20, 28, TITLE_PX, 1, width, text);
}

/* Range of n values at stride st, skipping non-finite ones; returns the
 * number of finite values seen. */
static size_t span(const double *v, size_t st, size_t n, double *lo, double *hi)
{
    size_t k = 0;
    if (!st)
        st = 1;
    for (size_t i = 0; i < n; i++) {
        double x = v[i * st];
        if (!isfinite(x))
            continue;
        if (!k || x < *lo)
            *lo = x;
        if (!k || x > *hi)
            *hi = x;
        k++;
    }
    return k;
}

static int finite_all(const double *v, size_t n)
{
    for (size_t i = 0; i < n; i++)
        if (!isfinite(v[i]))
            return 0;
    return 1;
}

/* A caption line below the title. */
static void caption(FILE *out, double x, double y, const char *text)
{
    hf_svg_text(out, x, y, 's', TICK_PX, 0, 0, text);
}

/* ---- label placement and overload marks ------------------------------------ */

/* A pixel rectangle. */
typedef struct {
    double x0, y0, x1, y1;
} rect;

/* The box a text of `size` px takes at (x, y) with the given anchor, from
 * the same 0.62 em a character estimate as the axes, with 2 px to spare. */
static rect text_rect(double x, double y, char anchor, double size, const char *s)
{
    double w = 0.62 * size * (double)strlen(s);
    double x0 = anchor == 'e' ? x - w : anchor == 'm' ? x - 0.5 * w : x;
    rect r = {x0 - 2, y - 0.8 * size - 1, x0 + w + 2, y + 0.25 * size + 1};
    return r;
}

/* 1 when the segment (x0, y0)-(x1, y1) meets r (Liang & Barsky (1984)
 * parametric clipping). */
static int seg_meets(rect r, double x0, double y0, double x1, double y1)
{
    double t0 = 0, t1 = 1, dx = x1 - x0, dy = y1 - y0;
    double p[4] = {-dx, dx, -dy, dy}, q[4] = {x0 - r.x0, r.x1 - x0, y0 - r.y0, r.y1 - y0};
    for (int i = 0; i < 4; i++) {
        if (p[i] == 0) {
            if (q[i] < 0)
                return 0;
            continue;
        }
        double t = q[i] / p[i];
        if (p[i] < 0 && t > t0)
            t0 = t;
        if (p[i] > 0 && t < t1)
            t1 = t;
        if (t0 > t1)
            return 0;
    }
    return 1;
}

/* A label test: 1 when box r is clear of whatever ctx describes. */
typedef int (*clear_fn)(const void *ctx, rect r);

/* The label of a reference line at pixel row py across panel a: end-anchored
 * at the first of nine positions from the right end to the left end, above
 * the line, then below it, whose box is inside the panel and clear (ok);
 * when none is, written under the panel's axis label as "dash-dot line: ...",
 * one row of 14 px per `slot` (the caller's count of such lines). */
static void ref_label(FILE *out, const hf_svg_axes *a, double py, const char *lab, clear_fn ok,
                      const void *ctx, int slot)
{
    double w = 0.62 * TICK_PX * (double)strlen(lab) + 8, right = a->left + a->width - 4;
    double room = a->width - w > 0 ? a->width - w : 0;
    for (int below = 0; below < 2; below++)
        for (int k = 0; k <= 8; k++) {
            double xe = right - k * room / 8, y = below ? py + 15 : py - 5;
            rect r = text_rect(xe, y, 'e', TICK_PX, lab);
            if (r.y0 >= a->top - 4 && r.y1 <= a->top + a->height && ok(ctx, r)) {
                text_ex(out, xe, y, 'e', TICK_PX, 0, 0, 1, lab);
                return;
            }
        }
    char buf[96];
    snprintf(buf, sizeof buf, "dash-dot line: %s", lab);
    hf_svg_text(out, a->left, a->top + a->height + 58 + 14.0 * slot, 's', TICK_PX, 0, 0, buf);
}

/* A cross (x) of half-size r px centred on (px, py), black on a white halo:
 * the mark of an overloaded point. */
static void cross(FILE *out, double px, double py, double r)
{
    for (int k = 0; k < 2; k++) {
        fputs("<path d=\"M", out);
        putnum(out, clampp(px - r));
        putc(' ', out);
        putnum(out, clampp(py - r));
        fputs("L", out);
        putnum(out, clampp(px + r));
        putc(' ', out);
        putnum(out, clampp(py + r));
        fputs("M", out);
        putnum(out, clampp(px - r));
        putc(' ', out);
        putnum(out, clampp(py + r));
        fputs("L", out);
        putnum(out, clampp(px + r));
        putc(' ', out);
        putnum(out, clampp(py - r));
        fprintf(out, "\" stroke=\"%s\" stroke-width=\"%s\" stroke-linecap=\"round\"/>\n",
                k ? INK : "#ffffff", k ? "2.2" : "5");
    }
}

/* The key entry of the overload mark at pixel (x, y) (top left). */
static void key_overloaded(FILE *out, double x, double y)
{
    cross(out, x + 13, y + 9, 5);
    hf_svg_text(out, x + 32, y + 13, 's', TICK_PX, 0, 0, "overloaded");
    hf_svg_text(out, x + 32, y + 29, 's', 11, 0, 0, "(tension >= MBL)");
}

/* ---- (1) elevation -------------------------------------------------------- */

#define EL_W 880.0
#define EL_H 680.0
#define EL_BINS 48
#define EL_LOW_H 170.0 /* tension panel height, px */
#define EL_BAR_X 730.0 /* colour bar (and legend) column */

/* The elevation's layout, worked out once before anything is written. */
typedef struct {
    hf_svg_axes top, low;      /* the line's panel and the tension panel */
    double tmin, tmax;         /* tension range along the line(s), N */
    const hf_svg_elevation *e; /* the lines drawn (1, or n overlaid) */
    size_t n;
    rect taken[16]; /* labels and markers placed so far in the top panel */
    size_t ntaken;
} elev;

/* Records box r as taken (labels after it keep clear of it). */
static void elev_take(elev *L, rect r)
{
    if (L->ntaken < sizeof L->taken / sizeof L->taken[0])
        L->taken[L->ntaken++] = r;
}

size_t hf_svg_sections_from_line(const hf_line *line, double required, hf_svg_section *out,
                                 size_t cap)
{
    if (!line)
        return 0;
    double end = 0.0;
    for (size_t s = 0; s < line->n && s < cap; s++) {
        end += line->sec[s].length;
        out[s].end_arc = end;
        out[s].mbl = line->sec[s].mbl;
        out[s].allowed = required > 0.0 ? line->sec[s].mbl / required : 0.0;
    }
    return line->n;
}

/* Section of profile point p: the first whose end is not before it. */
static size_t section_of(const hf_svg_elevation *e, const hf_line_point *p)
{
    size_t s = 0;
    while (s + 1 < e->nsections && p->arc > e->sections[s].end_arc * (1 + 1e-12) + 1e-9)
        s++;
    return s;
}

/* 1 when point i of e is overloaded: tension >= the MBL of its section. */
static int overloaded(const hf_svg_elevation *e, size_t i)
{
    if (!e->nsections)
        return 0;
    double mbl = e->sections[section_of(e, &e->pts[i])].mbl;
    return mbl > 0 && e->pts[i].tension >= mbl;
}

/* Validates e; HF_OK or HF_EINVAL with a message. */
static hf_status elev_check(const hf_svg_elevation *e, hf_error *err)
{
    if (!e || !e->pts || e->npts < 2)
        return hf_error_set(err, HF_EINVAL, "elevation figure: expected a profile of >= 2 points");
    if (!(e->water_height > 0.0) || !isfinite(e->water_height))
        return hf_error_set(err, HF_EINVAL,
                            "elevation figure: expected a positive water height, got %g",
                            e->water_height);
    if (!isfinite(e->tension_limit) || e->tension_limit < 0.0 ||
        (e->has_touchdown && !isfinite(e->touchdown_x)))
        return hf_error_set(err, HF_EINVAL, "elevation figure: limit or touchdown not finite");
    if (e->nsections && !e->sections)
        return hf_error_set(err, HF_EINVAL, "elevation figure: sections missing");
    for (size_t s = 0; s < e->nsections; s++) {
        const hf_svg_section *q = &e->sections[s];
        if (!isfinite(q->end_arc) || !isfinite(q->mbl) || q->mbl < 0 || !isfinite(q->allowed) ||
            q->allowed < 0 || (s && !(q->end_arc > e->sections[s - 1].end_arc)))
            return hf_error_set(err, HF_EINVAL,
                                "elevation figure: section %zu: expected increasing ends and "
                                "finite MBL and allowed tension >= 0",
                                s);
    }
    for (size_t i = 0; i < e->npts; i++) {
        const hf_line_point *p = &e->pts[i];
        if (!isfinite(p->x) || !isfinite(p->z) || !isfinite(p->tension) || !isfinite(p->arc))
            return hf_error_set(err, HF_EINVAL, "elevation figure: profile point %zu is not finite",
                                i);
    }
    return HF_OK;
}

/* Largest allowed tension of e, N (0 = none). */
static double elev_allowed_max(const hf_svg_elevation *e)
{
    double m = e->nsections ? 0.0 : e->tension_limit;
    for (size_t s = 0; s < e->nsections; s++)
        m = fmax(m, e->sections[s].allowed);
    return m;
}

/* The two panels' axes over every line drawn: the lines over the water
 * depth from `top` px down, the tension below sharing the horizontal axis
 * and reaching the largest allowed tension, so every limit is drawn. */
static hf_status elev_layout(elev *L, double top, hf_error *err)
{
    double xmin = 0, xmax = 0, zmin = 0, zmax = L->e[0].water_height, amax = 0;
    int first = 1;
    for (size_t k = 0; k < L->n; k++) {
        const hf_svg_elevation *e = &L->e[k];
        for (size_t i = 0; i < e->npts; i++, first = 0) {
            const hf_line_point *p = &e->pts[i];
            xmin = fmin(xmin, p->x);
            xmax = fmax(xmax, p->x);
            zmin = fmin(zmin, p->z);
            zmax = fmax(zmax, p->z);
            L->tmin = first ? p->tension : fmin(L->tmin, p->tension);
            L->tmax = first ? p->tension : fmax(L->tmax, p->tension);
        }
        amax = fmax(amax, elev_allowed_max(e));
    }
    double ts = tan(L->e[0].seabed_slope); /* a sloped seabed reaches below z = 0 */
    if (ts != 0.0)
        zmin = fmin(zmin, fmin(xmin * ts, xmax * ts));
    /* The seabed is the bottom of the panel (z = 0 unless the profile dips). */
    hf_status s =
        hf_svg_axes_init(&L->top, 90, top, 600, 270, xmin, xmax, zmin, zmax * 1.04, 0, err);
    if (s != HF_OK)
        return s;
    double t1 = fmax(L->tmax, amax) / 1e3 * 1.05;
    if (t1 <= 0.0)
        t1 = 1.0;
    s = hf_svg_axes_init(&L->low, 90, top + 346, 600, EL_LOW_H, L->top.xt.lo, L->top.xt.hi, 0.0, t1,
                         0, err);
    /* Share the horizontal axis exactly. */
    L->low.xt = L->top.xt;
    return s;
}

/* 1 when a label box r in the top panel is clear of the still water level,
 * the seabed, every line drawn, and the colour bar column. */
static int elev_clear(const elev *L, rect r)
{
    const hf_svg_axes *a = &L->top;
    double sw = hf_svg_axes_py(a, L->e[0].water_height), sb = hf_svg_axes_py(a, 0.0);
    double xl = a->left, xr = a->left + a->width;
    if (r.x1 > EL_BAR_X - 8 || r.x0 < 4 || r.y0 < a->top - 20 || r.y1 > a->top + a->height)
        return 0;
    for (size_t k = 0; k < L->ntaken; k++)
        if (r.x0 < L->taken[k].x1 && L->taken[k].x0 < r.x1 && r.y0 < L->taken[k].y1 &&
            L->taken[k].y0 < r.y1)
            return 0;
    if (seg_meets(r, xl, sw, xr, sw) || seg_meets(r, xl, sb - 2, xr, sb - 2))
        return 0;
    for (size_t k = 0; k < L->n; k++) {
        const hf_line_point *p = L->e[k].pts;
        for (size_t i = 0; i + 1 < L->e[k].npts; i++)
            if (seg_meets(r, hf_svg_axes_px(a, p[i].x), hf_svg_axes_py(a, p[i].z),
                          hf_svg_axes_px(a, p[i + 1].x), hf_svg_axes_py(a, p[i + 1].z)))
                return 0;
    }
    return 1;
}

/* A label offset from pixel (px, py): the first of the candidate spots
 * (dx, dy, anchor) whose box is clear (elev_clear), else the first; its box
 * is then taken. */
typedef struct {
    double dx, dy;
    char anchor;
} spot;

static void elev_label(FILE *out, elev *L, double px, double py, const spot *c, size_t nc,
                       const char *text)
{
    size_t k = 0;
    for (size_t i = 0; i < nc; i++)
        if (elev_clear(L, text_rect(px + c[i].dx, py + c[i].dy, c[i].anchor, TICK_PX, text))) {
            k = i;
            break;
        }
    text_ex(out, px + c[k].dx, py + c[k].dy, c[k].anchor, TICK_PX, 0, 0, 1, text);
    elev_take(L, text_rect(px + c[k].dx, py + c[k].dy, c[k].anchor, TICK_PX, text));
}

/* A sloped seabed (issue 15): the line z = x tan(slope) through the anchor
 * across the panel, the sand below it. */
static void elev_slope(FILE *out, const elev *L)
{
    const hf_svg_axes *a = &L->top;
    double ts = tan(L->e[0].seabed_slope), x0 = a->xt.lo, x1 = a->xt.hi;
    double px0 = hf_svg_axes_px(a, x0), px1 = hf_svg_axes_px(a, x1);
    double py0 = hf_svg_axes_py(a, x0 * ts), py1 = hf_svg_axes_py(a, x1 * ts);
    double bot = a->top + a->height;
    fputs("<polygon points=\"", out);
    putnum(out, px0);
    fputc(',', out);
    putnum(out, clampp(py0));
    fputc(' ', out);
    putnum(out, px1);
    fputc(',', out);
    putnum(out, clampp(py1));
    fputc(' ', out);
    putnum(out, px1);
    fputc(',', out);
    putnum(out, fmax(bot, py1));
    fputc(' ', out);
    putnum(out, px0);
    fputc(',', out);
    putnum(out, fmax(bot, py0));
    fputs("\" fill=\"" SEABED_FILL "\"/>\n", out);
    seg(out, px0, py0, px1, py1, SEABED, 4, "");
}

/* Caption, seabed (a sand band under it when the axis reaches below), the
 * elevation axes and the still water level, with their labels. */
static void elev_ground(FILE *out, elev *L)
{
    const hf_svg_axes *top = &L->top;
    double hx = top->width / (top->xt.hi - top->xt.lo),
           hz = top->height / (top->yt.hi - top->yt.lo);
    char cap[160];
    if (hz / hx > 1.5)
        snprintf(cap, sizeof cap,
                 "Side view in the line's vertical plane; vertical scale exaggerated %.0f times.",
                 hz / hx);
    else
        snprintf(cap, sizeof cap, "Side view in the line's vertical plane.");
    caption(out, 20, 48, cap);
    double sb = hf_svg_axes_py(top, 0.0), bot = top->top + top->height;
    if (L->e[0].seabed_slope != 0.0) { /* sloped: the seabed through the anchor */
        elev_slope(out, L);
    } else if (bot > sb + 0.5) {
        fputs("<rect x=\"", out);
        putnum(out, top->left);
        fputs("\" y=\"", out);
        putnum(out, sb);
        fputs("\" width=\"", out);
        putnum(out, top->width);
        fputs("\" height=\"", out);
        putnum(out, bot - sb);
        fputs("\" fill=\"" SEABED_FILL "\"/>\n", out);
    }
    hf_svg_axes_draw(out, top, "horizontal distance from the anchor (m)",
                     "height above the seabed (m)", "Elevation");
    double xr = top->left + top->width;
    if (L->e[0].seabed_slope != 0.0) /* drawn by elev_slope; labelled at its right end */
        sb = hf_svg_axes_py(top, top->xt.hi * tan(L->e[0].seabed_slope));
    else
        seg(out, top->left, sb, xr, sb, SEABED, 4, "");
    double sw = hf_svg_axes_py(top, L->e[0].water_height);
    seg(out, top->left, sw, xr, sw, WATER, 1.5, "9 4");
    static const spot sbs[] = {{-4, -8, 'e'}, {-150, -8, 'e'}, {-300, -8, 'e'}, {-4, 16, 'e'}};
    elev_label(out, L, xr, sb, sbs, 4, "seabed");
    static const spot sws[] = {{6, -6, 's'}, {6, 16, 's'}, {200, -6, 's'}, {200, 16, 's'}};
    elev_label(out, L, top->left, sw, sws, 4, "still water level");
}

/* The line coloured by tension: consecutive segments of one colour bin share
 * a polyline. */
static void elev_line(FILE *out, const hf_svg_elevation *e, const elev *L)
{
    double tr = L->tmax - L->tmin;
    int prev = -1;
    char colour[8];
    for (size_t i = 0; i + 1 < e->npts; i++) {
        double tm = 0.5 * (e->pts[i].tension + e->pts[i + 1].tension);
        double u = tr > 0 ? (tm - L->tmin) / tr : 0.5;
        int bin = (int)floor(u * EL_BINS);
        if (bin >= EL_BINS)
            bin = EL_BINS - 1;
        if (bin != prev) {
            if (prev >= 0)
                fputs("\"/>\n", out);
            hf_svg_scale_colour((bin + 0.5) / EL_BINS, colour);
            fprintf(out,
                    "<polyline fill=\"none\" stroke=\"%s\" stroke-width=\"3.5\" "
                    "stroke-linejoin=\"round\" stroke-linecap=\"round\" points=\"",
                    colour);
            putnum(out, hf_svg_axes_px(&L->top, e->pts[i].x));
            putc(',', out);
            putnum(out, hf_svg_axes_py(&L->top, e->pts[i].z));
            prev = bin;
        }
        putc(' ', out);
        putnum(out, hf_svg_axes_px(&L->top, e->pts[i + 1].x));
        putc(',', out);
        putnum(out, hf_svg_axes_py(&L->top, e->pts[i + 1].z));
    }
    fputs("\"/>\n", out);
}

/* Label spots around a marker, the preferred first. */
static const spot anchor_spots[] = {{10, -10, 's'}, {10, -24, 's'}, {-10, -10, 'e'}, {2, -26, 's'}};
static const spot touch_spots[] = {{-8, -10, 'e'}, {8, -10, 's'},  {-8, -24, 'e'},
                                   {8, -24, 's'},  {40, -10, 's'}, {40, -24, 's'}};
static const spot fair_spots[] = {{-10, -8, 'e'},  {-12, 4, 'e'},  {-10, 18, 'e'},
                                  {-10, -20, 'e'}, {-40, -8, 'e'}, {-40, 20, 'e'}};

/* A marker's box (size px across) at pixel (px, py), taken. */
static void take_marker(elev *L, double px, double py, double size)
{
    double r = 0.5 * size;
    elev_take(L, (rect){px - r, py - r, px + r, py + r});
}

/* Anchor, touchdown and fairlead markers of e, then, when `labels`, their
 * labels clear of every marker and of the labels placed before. */
static void elev_marks(FILE *out, const hf_svg_elevation *e, elev *L, int labels)
{
    const hf_line_point *an = &e->pts[0], *fl = &e->pts[e->npts - 1];
    const hf_svg_axes *a = &L->top;
    double ax = hf_svg_axes_px(a, an->x), ay = hf_svg_axes_py(a, an->z);
    double tx = hf_svg_axes_px(a, e->touchdown_x), ty = hf_svg_axes_py(a, 0.0);
    double fx = hf_svg_axes_px(a, fl->x), fy = hf_svg_axes_py(a, fl->z);
    int td = e->has_touchdown && e->touchdown_x > an->x;
    hf_svg_marker(out, a, an->x, an->z, HF_SVG_SQUARE, 11, INK, NULL, 0, 0);
    if (td)
        hf_svg_marker(out, a, e->touchdown_x, 0.0, HF_SVG_TRIANGLE, 12, "#ffffff", NULL, 0, 0);
    hf_svg_marker(out, a, fl->x, fl->z, HF_SVG_CIRCLE, 11, "#ffffff", NULL, 0, 0);
    if (!labels)
        return;
    take_marker(L, ax, ay, 11);
    if (td)
        take_marker(L, tx, ty, 12);
    take_marker(L, fx, fy, 11);
    elev_label(out, L, ax, ay, anchor_spots, 4, "anchor");
    if (td)
        elev_label(out, L, tx, ty, touch_spots, 6, "touchdown");
    elev_label(out, L, fx, fy, fair_spots, 6, "fairlead");
}

/* The tension colour bar right of the elevation: its ends (tmin, tmax) and
 * the round-number ticks between them that keep 16 px clear of the end
 * labels. */
static void elev_colourbar(FILE *out, const elev *L)
{
    double bx = EL_BAR_X, by = L->top.top, bh = L->top.height, bw = 16, tr = L->tmax - L->tmin;
    char colour[8], lab[96];
    hf_svg_text(out, bx - 6, by - 12, 's', LABEL_PX, 1, 0, "tension (kN)");
    for (int k = 0; k < EL_BINS; k++) {
        hf_svg_scale_colour((k + 0.5) / EL_BINS, colour);
        double y0 = by + bh - (k + 1) * bh / EL_BINS;
        fputs("<rect x=\"", out);
        putnum(out, bx);
        fputs("\" y=\"", out);
        putnum(out, y0);
        fprintf(out, "\" width=\"%g\" height=\"", bw);
        putnum(out, bh / EL_BINS + 0.3);
        fprintf(out, "\" fill=\"%s\"/>\n", colour);
    }
    fprintf(out,
            "<rect x=\"%g\" y=\"%g\" width=\"%g\" height=\"%g\" fill=\"none\" stroke=\"" INK
            "\" stroke-width=\"1\"/>\n",
            bx, by, bw, bh);
    for (int k = 0; k < 2; k++) {
        double yy = k ? by : by + bh;
        snprintf(lab, sizeof lab, "%.4g", (k ? L->tmax : L->tmin) / 1e3);
        seg(out, bx + bw, yy, bx + bw + 4, yy, INK, 1, "");
        hf_svg_text(out, bx + bw + 7, yy + 4, 's', TICK_PX, 0, 0, lab);
        if (tr <= 0)
            break;
    }
    hf_svg_ticks bt;
    if (tr > 0 && hf_svg_ticks_choose(L->tmin / 1e3, L->tmax / 1e3, 5, &bt, NULL) == HF_OK) {
        for (size_t k = 0; k < bt.n; k++) {
            double v = hf_svg_tick_value(&bt, k);
            double yy = by + bh - (v - L->tmin / 1e3) / (tr / 1e3) * bh;
            if (yy < by + 16 || yy > by + bh - 16)
                continue;
            hf_svg_tick_label(&bt, k, lab, sizeof lab);
            seg(out, bx + bw, yy, bx + bw + 4, yy, INK, 1, "");
            hf_svg_text(out, bx + bw + 7, yy + 4, 's', TICK_PX, 0, 0, lab);
        }
    }
}

/* 1 when a label box on the tension panel is clear of every tension curve. */
static int low_clear(const elev *L, rect r)
{
    const hf_svg_axes *a = &L->low;
    if (r.x0 < a->left || r.x1 > a->left + a->width || r.y0 < a->top - 4)
        return 0;
    for (size_t k = 0; k < L->n; k++) {
        const hf_line_point *p = L->e[k].pts;
        for (size_t i = 0; i + 1 < L->e[k].npts; i++)
            if (seg_meets(r, hf_svg_axes_px(a, p[i].x), hf_svg_axes_py(a, p[i].tension / 1e3),
                          hf_svg_axes_px(a, p[i + 1].x), hf_svg_axes_py(a, p[i + 1].tension / 1e3)))
                return 0;
    }
    return 1;
}

/* One step of the allowed-tension line: allowed (kN) from pixel x0 to x1 on
 * the tension panel, labelled with its value above or below when the label
 * fits and is clear of the curves. */
static void elev_step(FILE *out, const elev *L, double x0, double x1, double kn)
{
    double py = hf_svg_axes_py(&L->low, kn);
    seg(out, x0, py, x1, py, REFLINE, 1.5, "8 3 2 3");
    char lab[64];
    snprintf(lab, sizeof lab, "allowed %.4g kN", kn);
    double cx = 0.5 * (x0 + x1);
    for (int k = 0; k < 2; k++) {
        double y = k ? py + 15 : py - 5;
        rect r = text_rect(cx, y, 'm', TICK_PX, lab);
        if (r.x0 >= x0 - 2 && r.x1 <= x1 + 2 && low_clear(L, r)) {
            text_ex(out, cx, y, 'm', TICK_PX, 0, 0, 1, lab);
            return;
        }
    }
}

/* The allowed tension of each section (runs of equal value merged) as a
 * dashed step line over the horizontal extent of the section's points;
 * returns 1 when anything was drawn. */
static int elev_allowed(FILE *out, const hf_svg_elevation *e, const elev *L)
{
    const hf_svg_axes *a = &L->low;
    int drawn = 0;
    double run = -1, x0 = 0, x1 = 0;
    for (size_t i = 0; i <= e->npts; i++) {
        double v = -1;
        if (i < e->npts)
            v = e->nsections ? e->sections[section_of(e, &e->pts[i])].allowed : e->tension_limit;
        double px = i < e->npts ? hf_svg_axes_px(a, e->pts[i].x) : 0;
        if (i < e->npts && v == run) {
            x0 = fmin(x0, px);
            x1 = fmax(x1, px);
            continue;
        }
        if (run > 0 && x1 > x0) {
            elev_step(out, L, x0, x1, run / 1e3);
            drawn = 1;
        }
        run = v;
        x0 = x1 = px;
    }
    return drawn;
}

/* Crosses on both panels at the overloaded points of e: every point of a
 * run shorter than 3, else its first point and its largest tension.
 * Returns the number of overloaded points. */
static size_t elev_overloads(FILE *out, const hf_svg_elevation *e, const elev *L)
{
    size_t count = 0;
    for (size_t i = 0; i < e->npts;) {
        if (!overloaded(e, i)) {
            i++;
            continue;
        }
        size_t j = i, top = i;
        while (j < e->npts && overloaded(e, j)) {
            if (e->pts[j].tension > e->pts[top].tension)
                top = j;
            j++;
        }
        count += j - i;
        for (size_t k = i; k < j; k++) {
            if (j - i >= 3 && k != i && k != top)
                continue;
            const hf_line_point *p = &e->pts[k];
            cross(out, hf_svg_axes_px(&L->top, p->x), hf_svg_axes_py(&L->top, p->z), 5);
            cross(out, hf_svg_axes_px(&L->low, p->x), hf_svg_axes_py(&L->low, p->tension / 1e3), 5);
        }
        i = j;
    }
    return count;
}

/* The key under the colour bar: the allowed-tension line and the overload
 * mark, each when drawn. */
static void elev_key(FILE *out, const elev *L, int allowed, int over)
{
    double x = EL_BAR_X - 16, y = L->low.top;
    if (allowed) {
        seg(out, x, y + 9, x + 26, y + 9, REFLINE, 1.5, "8 3 2 3");
        hf_svg_text(out, x + 32, y + 13, 's', TICK_PX, 0, 0, "allowed tension");
        hf_svg_text(out, x + 32, y + 29, 's', 11, 0, 0, "(MBL / factor)");
        y += 40;
    }
    if (over)
        key_overloaded(out, x, y);
}

/* The tension panel, its title carrying the end tensions, the allowed
 * tensions and the overload marks, and the key. */
static void elev_tension(FILE *out, const hf_svg_elevation *e, const elev *L)
{
    char lab[96];
    snprintf(lab, sizeof lab, "Tension along the line: fairlead %.4g kN, anchor %.4g kN",
             e->pts[e->npts - 1].tension / 1e3, e->pts[0].tension / 1e3);
    hf_svg_axes_draw(out, &L->low, "horizontal distance from the anchor (m)", "tension (kN)", lab);
    /* polyline in kN: draw point by point without a scratch array */
    fputs("<polyline fill=\"none\" stroke=\"" INK "\" stroke-width=\"2\" "
          "stroke-linejoin=\"round\" points=\"",
          out);
    for (size_t i = 0; i < e->npts; i++) {
        if (i)
            putc(' ', out);
        putnum(out, hf_svg_axes_px(&L->low, e->pts[i].x));
        putc(',', out);
        putnum(out, hf_svg_axes_py(&L->low, e->pts[i].tension / 1e3));
    }
    fputs("\"/>\n", out);
    int allowed = elev_allowed(out, e, L);
    size_t over = elev_overloads(out, e, L);
    elev_key(out, L, allowed, over > 0);
}

/* Figure (1), with the names of the lines it stands for when n > 0 (the
 * panels then start 16 px lower, under a caption listing them). */
static hf_status elev_figure(FILE *out, const hf_svg_elevation *e, const char *const *names,
                             size_t n, int standalone, hf_error *err)
{
    elev L = {.e = e, .n = 1};
    double dy = n ? 16.0 : 0.0;
    hf_status s = elev_check(e, err);
    if (s == HF_OK)
        s = elev_layout(&L, 84 + dy, err);
    if (s != HF_OK)
        return s;
    hf_svg_begin(out, EL_W, EL_H + dy, e->title, standalone);
    title(out, EL_W, e->title);
    if (n) {
        char buf[512];
        int k = snprintf(buf, sizeof buf,
                         "Drawn once for %zu line%s of the same make-up and "
                         "geometry:",
                         n, n == 1 ? "" : "s");
        for (size_t i = 0; i < n && k > 0 && (size_t)k < sizeof buf; i++)
            k += snprintf(buf + k, sizeof buf - (size_t)k, "%s %s", i ? "," : "", names[i]);
        clipped(out, 20, 64, TICK_PX, 0, EL_W, buf);
    }
    elev_ground(out, &L);
    elev_line(out, e, &L);
    elev_marks(out, e, &L, 1);
    elev_colourbar(out, &L);
    elev_tension(out, e, &L);
    hf_svg_end(out);
    return HF_OK;
}

hf_status hf_svg_figure_elevation(FILE *out, const hf_svg_elevation *e, int standalone,
                                  hf_error *err)
{
    return elev_figure(out, e, NULL, 0, standalone, err);
}

hf_status hf_svg_figure_elevation_group(FILE *out, const hf_svg_elevation *e,
                                        const char *const *names, size_t n, int standalone,
                                        hf_error *err)
{
    if (!names || n < 1)
        return hf_error_set(err, HF_EINVAL, "elevation figure: expected >= 1 line name");
    for (size_t i = 0; i < n; i++)
        if (!names[i])
            return hf_error_set(err, HF_EINVAL, "elevation figure: line name %zu missing", i);
    return elev_figure(out, e, names, n, standalone, err);
}

/* A profile as one series on axes a: height (tension 0) or tension in kN
 * (tension 1) against horizontal distance, through the shared polyline
 * writer. */
static void profile_series(FILE *out, const hf_svg_axes *a, const hf_svg_elevation *e, int tension,
                           const char *colour, double width, const char *dash)
{
    pline l = {out, colour, dash, width, 0, 0, 0, 0, {0}, {0}, {0}};
    l.dense = (double)e->npts > 4.0 * a->width;
    for (size_t i = 0; i < e->npts; i++) {
        const hf_line_point *p = &e->pts[i];
        pl_add(&l, i, hf_svg_axes_px(a, p->x),
               hf_svg_axes_py(a, tension ? p->tension / 1e3 : p->z));
    }
    pl_close(&l);
}

static int low_clear_cb(const void *ctx, rect r)
{
    return low_clear((const elev *)ctx, r);
}

/* An allowed tension (kN) across the tension panel, its label placed clear
 * of every tension curve (ref_label). */
static void low_hline(FILE *out, const elev *L, double kn, int slot)
{
    const hf_svg_axes *a = &L->low;
    double py = hf_svg_axes_py(a, kn);
    seg(out, a->left, py, a->left + a->width, py, REFLINE, 1.5, "8 3 2 3");
    char lab[64];
    snprintf(lab, sizeof lab, "allowed %.4g kN", kn);
    ref_label(out, a, py, lab, low_clear_cb, L, slot);
}

/* The overlay's tension panel: every line's tension in its series style,
 * the distinct allowed tensions (up to 4) as reference lines, overload
 * crosses; returns the number of overloaded points. */
static size_t overlay_tension(FILE *out, const elev *L)
{
    hf_svg_axes_draw(out, &L->low, "horizontal distance from the anchor (m)", "tension (kN)",
                     "Tension along each line");
    double seen[4];
    int ns = 0;
    size_t over = 0;
    for (size_t k = 0; k < L->n; k++) {
        const hf_svg_elevation *e = &L->e[k];
        profile_series(out, &L->low, e, 1, hf_svg_colour(k), 2, hf_svg_dash(k));
        for (size_t s = 0; s < (e->nsections ? e->nsections : 1); s++) {
            double v = e->nsections ? e->sections[s].allowed : e->tension_limit;
            int dup = !(v > 0) || ns == 4;
            for (int q = 0; q < ns; q++)
                dup |= fabs(seen[q] - v) <= 1e-9 * v;
            if (dup)
                continue;
            seen[ns++] = v;
            low_hline(out, L, v / 1e3, ns - 1);
        }
    }
    for (size_t k = 0; k < L->n; k++)
        over += elev_overloads(out, &L->e[k], L);
    return over;
}

hf_status hf_svg_figure_elevation_overlay(FILE *out, const char *title_text,
                                          const hf_svg_elevation *e, const char *const *names,
                                          size_t n, int standalone, hf_error *err)
{
    if (!e || n < 1)
        return hf_error_set(err, HF_EINVAL, "elevation overlay: expected >= 1 line");
    for (size_t k = 0; k < n; k++) {
        hf_error sub;
        hf_error_clear(&sub);
        hf_status s = elev_check(&e[k], &sub);
        if (s != HF_OK)
            return hf_error_set(err, s, "elevation overlay, line %zu: %s", k + 1, sub.text);
    }
    elev L = {.e = e, .n = n};
    hf_status s = elev_layout(&L, 84, err);
    if (s != HF_OK)
        return s;
    hf_svg_begin(out, EL_W, EL_H, title_text, standalone);
    title(out, EL_W, title_text);
    elev_ground(out, &L);
    for (size_t k = 0; k < n; k++)
        profile_series(out, &L.top, &e[k], 0, hf_svg_colour(k), 2.5, hf_svg_dash(k));
    for (size_t k = 0; k < n; k++)
        elev_marks(out, &e[k], &L, 0);
    size_t over = overlay_tension(out, &L);
    hf_svg_text(out, EL_BAR_X - 6, L.top.top - 12, 's', LABEL_PX, 1, 0, "Lines");
    /* marker key under the legend (the markers are not labelled one by one) */
    size_t fit = (size_t)((L.top.height - 60) / 18.0), shown = n < fit ? n : fit;
    double ky = L.top.top + 18.0 * (double)shown + 12;
    if (shown < n) {
        char more[48];
        snprintf(more, sizeof more, "... and %zu more", n - shown);
        hf_svg_text(out, EL_BAR_X - 6, ky, 's', TICK_PX, 0, 0, more);
        ky += 10;
    }
    static const char *const mk[3] = {"anchor", "touchdown", "fairlead"};
    static const hf_svg_shape sh[3] = {HF_SVG_SQUARE, HF_SVG_TRIANGLE, HF_SVG_CIRCLE};
    for (int q = 0; q < 3; q++) {
        mark(out, EL_BAR_X + 7, ky + 9 + 18 * q, sh[q], 10, q ? "#ffffff" : INK);
        hf_svg_text(out, EL_BAR_X + 26, ky + 13 + 18 * q, 's', TICK_PX, 0, 0, mk[q]);
    }
    hf_svg_legend(out, EL_BAR_X - 6, L.top.top, names, NULL, shown);
    if (!names)
        for (size_t k = 0; k < shown; k++) {
            char lab[32];
            snprintf(lab, sizeof lab, "line %zu", k + 1);
            hf_svg_text(out, EL_BAR_X + 26, L.top.top + 18.0 * (double)k + 13, 's', TICK_PX, 0, 0,
                        lab);
        }
    elev_key(out, &L, 0, over > 0);
    hf_svg_end(out);
    return HF_OK;
}

void hf_svg_direction_label(double rad, char *buf, size_t cap)
{
    if (!isfinite(rad)) {
        snprintf(buf, cap, "?");
        return;
    }
    /* reduce in degrees (exact fmod), then fold [-360, 0) up and -0 to 0 */
    double d = fmod(rad * (180.0 / M_PI), 360.0);
    if (d < 0)
        d += 360.0;
    if (d >= 360.0 || d == 0.0)
        d = 0.0;
    char tmp[32];
    snprintf(tmp, sizeof tmp, "%.4g", d);
    if (!strcmp(tmp, "360"))
        snprintf(tmp, sizeof tmp, "0");
    snprintf(buf, cap, "%s deg", tmp);
}

/* ---- (2) plan ------------------------------------------------------------- */

#define PL_W 960.0
#define PL_KEY_X 742.0 /* the right-hand column: key and hull detail */
#define PL_INSET_Y 230.0
#define PL_INSET 200.0

/* Convex hull of the fairleads by gift wrapping (Jarvis 1973), emitted
 * straight into a polygon's points: no allocation.  O(n h). */
static void hull_points(FILE *out, const hf_svg_axes *a, const double (*p)[2], size_t n)
{
    size_t start = 0;
    for (size_t i = 1; i < n; i++)
        if (p[i][0] < p[start][0] || (p[i][0] == p[start][0] && p[i][1] < p[start][1]))
            start = i;
    size_t cur = start, guard = 0;
    do {
        if (guard)
            putc(' ', out);
        putnum(out, hf_svg_axes_px(a, p[cur][0]));
        putc(',', out);
        putnum(out, hf_svg_axes_py(a, p[cur][1]));
        size_t next = (cur + 1) % n;
        for (size_t i = 0; i < n; i++) {
            double cr = (p[next][0] - p[cur][0]) * (p[i][1] - p[cur][1]) -
                        (p[next][1] - p[cur][1]) * (p[i][0] - p[cur][0]);
            double dn = hypot(p[next][0] - p[cur][0], p[next][1] - p[cur][1]);
            double di = hypot(p[i][0] - p[cur][0], p[i][1] - p[cur][1]);
            if (cr < 0 || (cr == 0 && di > dn))
                next = i;
        }
        cur = next;
    } while (cur != start && ++guard <= n);
}

/* The hull on axes a: the outline polygon, or the hull through the fairleads. */
static void hull_shape(FILE *out, const hf_svg_axes *a, const hf_svg_plan *p)
{
    if (p->noutline) {
        fputs("<polygon fill=\"" HULL_FILL "\" stroke=\"" INK "\" stroke-width=\"1.5\" points=\"",
              out);
        for (size_t i = 0; i < p->noutline; i++) {
            if (i)
                putc(' ', out);
            putnum(out, hf_svg_axes_px(a, p->outline[i][0]));
            putc(',', out);
            putnum(out, hf_svg_axes_py(a, p->outline[i][1]));
        }
        fputs("\"/>\n", out);
    } else if (p->nlines >= 3) {
        fputs("<polygon fill=\"" HULL_FILL "\" stroke=\"" INK "\" stroke-width=\"1.5\" "
              "stroke-dasharray=\"6 3\" points=\"",
              out);
        hull_points(out, a, p->fairlead, p->nlines);
        fputs("\"/>\n", out);
    }
}

/* A bold arrow from pixel (x, y) along unit (ux, uy) (pixel axes), len px. */
static void arrow(FILE *out, double x, double y, double ux, double uy, double len)
{
    double tx = x + len * ux, ty = y + len * uy;
    seg(out, x, y, tx - 10 * ux, ty - 10 * uy, INK, 3, "");
    fputs("<polygon fill=\"" INK "\" points=\"", out);
    putnum(out, tx);
    putc(',', out);
    putnum(out, ty);
    putc(' ', out);
    putnum(out, tx - 14 * ux - 6 * uy);
    putc(',', out);
    putnum(out, ty - 14 * uy + 6 * ux);
    putc(' ', out);
    putnum(out, tx - 14 * ux + 6 * uy);
    putc(',', out);
    putnum(out, ty - 14 * uy - 6 * ux);
    fputs("\"/>\n", out);
}

/* Widens the box b = {x0, x1, y0, y1} to hold point q. */
static void grow(double b[4], const double q[2])
{
    b[0] = fmin(b[0], q[0]);
    b[1] = fmax(b[1], q[0]);
    b[2] = fmin(b[2], q[1]);
    b[3] = fmax(b[3], q[1]);
}

/* The hull detail's box: reference point, fairleads, outlines (now and at
 * rest) and the rest reference point. */
static void inset_extent(const hf_svg_plan *p, double b[4])
{
    b[0] = b[1] = p->reference[0];
    b[2] = b[3] = p->reference[1];
    for (size_t i = 0; i < p->nlines; i++)
        grow(b, p->fairlead[i]);
    for (int r = 0; r < 2; r++) {
        const double(*o)[2] = r ? (p->has_rest ? p->rest_outline : NULL) : p->outline;
        for (size_t i = 0; o && i < p->noutline; i++)
            grow(b, o[i]);
    }
    if (p->has_rest && finite_all(p->rest_reference, 2))
        grow(b, p->rest_reference);
}

/* A closed polygon through n points on axes a, with the given style
 * attributes (everything before points="). */
static void polygon(FILE *out, const hf_svg_axes *a, const double (*v)[2], size_t n,
                    const char *attrs)
{
    fprintf(out, "<polygon %s points=\"", attrs);
    for (size_t i = 0; i < n; i++) {
        if (i)
            putc(' ', out);
        putnum(out, hf_svg_axes_px(a, v[i][0]));
        putc(',', out);
        putnum(out, hf_svg_axes_py(a, v[i][1]));
    }
    fputs("\"/>\n", out);
}

/* Each line from its fairlead toward its anchor, cut at the frame of h. */
static void inset_lines(FILE *out, const hf_svg_plan *p, const hf_svg_axes *h)
{
    for (size_t i = 0; i < p->nlines; i++) {
        double fx = p->fairlead[i][0], fy = p->fairlead[i][1];
        double dx = p->anchor[i][0] - fx, dy = p->anchor[i][1] - fy, t = 1.0;
        if (dx > 0)
            t = fmin(t, (h->xt.hi - fx) / dx);
        if (dx < 0)
            t = fmin(t, (h->xt.lo - fx) / dx);
        if (dy > 0)
            t = fmin(t, (h->yt.hi - fy) / dy);
        if (dy < 0)
            t = fmin(t, (h->yt.lo - fy) / dy);
        if (t < 0)
            t = 0;
        int broken = p->broken && p->broken[i];
        seg(out, hf_svg_axes_px(h, fx), hf_svg_axes_py(h, fy), hf_svg_axes_px(h, fx + t * dx),
            hf_svg_axes_py(h, fy + t * dy), broken ? "#999999" : hf_svg_colour(i), broken ? 1.2 : 2,
            broken ? "3 3" : hf_svg_dash(i));
    }
    for (size_t i = 0; i < p->nlines; i++)
        mark(out, hf_svg_axes_px(h, p->fairlead[i][0]), hf_svg_axes_py(h, p->fairlead[i][1]),
             HF_SVG_CIRCLE, 6, "#ffffff");
}

/* A scale bar under the frame of h, outside it so that no line crosses it:
 * a round length of about a third of the frame. */
static void scale_bar(FILE *out, const hf_svg_axes *h)
{
    hf_svg_ticks sb;
    if (hf_svg_ticks_choose(0, (h->xt.hi - h->xt.lo) / 3, 2, &sb, NULL) != HF_OK)
        return;
    double L = sb.step, px = L / (h->xt.hi - h->xt.lo) * h->width;
    double bx = h->left, by = h->top + h->height + 12;
    seg(out, bx, by, bx + px, by, INK, 2.5, "");
    seg(out, bx, by - 4, bx, by + 2, INK, 1.5, "");
    seg(out, bx + px, by - 4, bx + px, by + 2, INK, 1.5, "");
    char lab[48];
    hf_svg_tick_label(&sb, 1, lab, sizeof lab);
    size_t n = strlen(lab);
    snprintf(lab + n, sizeof lab - n, " m");
    text_ex(out, bx + px + 5, by + 4, 's', 11, 0, 0, 1, lab);
}

/* The hull detail: the hull, its fairleads and the first part of each line
 * at a scale that shows them (the main plan is usually too small for that),
 * with a scale bar, the hull at rest dashed and the offset when given. */
static void inset(FILE *out, const hf_svg_plan *p, double y)
{
    double b[4];
    inset_extent(p, b);
    double ext = fmax(fmax(b[1] - b[0], b[3] - b[2]), 1.0), pad = 0.3 * ext;
    hf_svg_axes h;
    if (hf_svg_axes_init(&h, PL_KEY_X, y, PL_INSET, PL_INSET, b[0] - pad, b[1] + pad, b[2] - pad,
                         b[3] + pad, 1, NULL) != HF_OK)
        return;
    /* the title just above the (equal-scale) frame */
    hf_svg_text(out, PL_KEY_X, h.top - 12, 's', LABEL_PX, 1, 0, "Hull detail");
    fprintf(out, "<rect x=\"");
    putnum(out, h.left);
    fputs("\" y=\"", out);
    putnum(out, h.top);
    fputs("\" width=\"", out);
    putnum(out, h.width);
    fputs("\" height=\"", out);
    putnum(out, h.height);
    fputs("\" fill=\"none\" stroke=\"" INK "\" stroke-width=\"1\"/>\n", out);
    if (p->has_rest && p->rest_outline && p->noutline)
        polygon(out, &h, p->rest_outline, p->noutline,
                "fill=\"none\" stroke=\"#777777\" stroke-width=\"1.2\" stroke-dasharray=\"4 3\"");
    hull_shape(out, &h, p);
    inset_lines(out, p, &h);
    double rx = hf_svg_axes_px(&h, p->reference[0]), ry = hf_svg_axes_py(&h, p->reference[1]);
    mark(out, rx, ry, HF_SVG_DIAMOND, 9, INK);
    if (p->has_load)
        arrow(out, rx, ry, cos(p->load_direction), -sin(p->load_direction), 40);
    scale_bar(out, &h);
    double ty = h.top + h.height + 36;
    if (p->has_rest && finite_all(p->rest_reference, 2)) {
        char lab[96];
        snprintf(
            lab, sizeof lab, "offset from rest %.3g m",
            hypot(p->reference[0] - p->rest_reference[0], p->reference[1] - p->rest_reference[1]));
        hf_svg_text(out, PL_KEY_X, ty, 's', TICK_PX, 0, 0, lab);
        if (p->rest_outline && p->noutline)
            hf_svg_text(out, PL_KEY_X, ty + 16, 's', 11, 0, 0, "dashed: hull at rest");
    }
}

/* Validates p and finds the box of everything drawn on the main plan. */
static hf_status plan_check(const hf_svg_plan *p, double b[4], hf_error *err)
{
    if (!p || p->nlines < 1 || !p->anchor || !p->fairlead)
        return hf_error_set(err, HF_EINVAL, "plan figure: expected at least one line");
    if (p->noutline && (!p->outline || p->noutline < 3))
        return hf_error_set(err, HF_EINVAL, "plan figure: a hull outline needs >= 3 vertices");
    if (!finite_all(p->reference, 2) || (p->has_load && !isfinite(p->load_direction)))
        return hf_error_set(err, HF_EINVAL, "plan figure: reference or load not finite");
    b[0] = b[1] = p->reference[0];
    b[2] = b[3] = p->reference[1];
    for (size_t i = 0; i < p->nlines; i++) {
        if (!finite_all(p->anchor[i], 2) || !finite_all(p->fairlead[i], 2))
            return hf_error_set(err, HF_EINVAL, "plan figure: line %zu has a non-finite position",
                                i);
        grow(b, p->fairlead[i]);
        grow(b, p->anchor[i]);
    }
    for (size_t i = 0; i < p->noutline; i++) {
        if (!finite_all(p->outline[i], 2))
            return hf_error_set(err, HF_EINVAL, "plan figure: outline vertex %zu not finite", i);
        grow(b, p->outline[i]);
    }
    return HF_OK;
}

/* The main plan's axes over box b: margins for the anchor names of 5 % of
 * the extent, then room for a label of about 100 px across and 24 px up and
 * down at the scale that gives (a second pass, since the scale depends on
 * the range); top-left aligned, so the figure is as tall as the plan needs. */
static hf_status plan_axes(hf_svg_axes *a, const double b[4], hf_error *err)
{
    double pad = 0.05 * fmax(fmax(b[1] - b[0], b[3] - b[2]), 1.0);
    hf_status s = hf_svg_axes_init(a, 100, 80, 600, 580, b[0] - pad, b[1] + pad, b[2] - pad,
                                   b[3] + pad, 1, err);
    if (s != HF_OK)
        return s;
    double mpp = (a->xt.hi - a->xt.lo) / a->width; /* metres per pixel */
    s = hf_svg_axes_init(a, 100, 80, 600, 580, b[0] - pad - 100 * mpp, b[1] + pad + 100 * mpp,
                         b[2] - pad - 24 * mpp, b[3] + pad + 24 * mpp, 1, err);
    a->left = 100;
    a->top = 80;
    return s;
}

/* Each line anchor -> fairlead with its markers, and its name beyond the
 * anchor, away from the reference point. */
static void plan_lines(FILE *out, const hf_svg_plan *p, const hf_svg_axes *a)
{
    double rx = hf_svg_axes_px(a, p->reference[0]), ry = hf_svg_axes_py(a, p->reference[1]);
    for (size_t i = 0; i < p->nlines; i++) {
        double ax = hf_svg_axes_px(a, p->anchor[i][0]), ay = hf_svg_axes_py(a, p->anchor[i][1]);
        double fx = hf_svg_axes_px(a, p->fairlead[i][0]), fy = hf_svg_axes_py(a, p->fairlead[i][1]);
        int broken = p->broken && p->broken[i];
        seg(out, ax, ay, fx, fy, broken ? "#999999" : hf_svg_colour(i), broken ? 1.5 : 2.5,
            broken ? "3 3" : hf_svg_dash(i));
        mark(out, ax, ay, HF_SVG_SQUARE, 10, broken ? "#ffffff" : hf_svg_colour(i));
        mark(out, fx, fy, HF_SVG_CIRCLE, 6, "#ffffff");
        double dx = ax - rx, dy = ay - ry, d = hypot(dx, dy);
        if (d > 0) {
            dx /= d;
            dy /= d;
        } else {
            dx = 1;
            dy = 0;
        }
        char name[160];
        if (p->names)
            snprintf(name, sizeof name, "%s%s", p->names[i], broken ? " (broken)" : "");
        else
            snprintf(name, sizeof name, "line %zu%s", i + 1, broken ? " (broken)" : "");
        text_ex(out, ax + 12 * dx, ay + 12 * dy + 4 + 4 * dy,
                dx > 0.35    ? 's'
                : dx < -0.35 ? 'e'
                             : 'm',
                TICK_PX, 0, 0, 1, name);
    }
}

/* One entry of the plan's line key at (x, y): a sample drawn as line i is
 * drawn, and its name. */
static void key_line(FILE *out, const hf_svg_plan *p, size_t i, double x, double y)
{
    int broken = p->broken && p->broken[i];
    seg(out, x, y + 9, x + 26, y + 9, broken ? "#999999" : hf_svg_colour(i), broken ? 1.5 : 2.5,
        broken ? "3 3" : hf_svg_dash(i));
    char name[160];
    if (p->names)
        snprintf(name, sizeof name, "%s%s", p->names[i], broken ? " (broken)" : "");
    else
        snprintf(name, sizeof name, "line %zu%s", i + 1, broken ? " (broken)" : "");
    clipped(out, x + 32, y + 13, TICK_PX, 0, PL_W, name);
}

/* The key at the top of the right-hand column: markers, the load with its
 * direction (0-360 deg, counter-clockwise from global x), and every line
 * with its colour and dash.  Returns the y below the key. */
static double plan_key(FILE *out, const hf_svg_plan *p)
{
    double kx = PL_KEY_X, ky = 90;
    hf_svg_text(out, kx, ky, 's', LABEL_PX, 1, 0, "Key");
    mark(out, kx + 6, ky + 18, HF_SVG_SQUARE, 10, "#ffffff");
    hf_svg_text(out, kx + 18, ky + 22, 's', TICK_PX, 0, 0, "anchor");
    mark(out, kx + 6, ky + 38, HF_SVG_CIRCLE, 6, "#ffffff");
    hf_svg_text(out, kx + 18, ky + 42, 's', TICK_PX, 0, 0, "fairlead");
    mark(out, kx + 6, ky + 58, HF_SVG_DIAMOND, 9, INK);
    hf_svg_text(out, kx + 18, ky + 62, 's', TICK_PX, 0, 0, "hull reference point");
    double y = ky + 70;
    if (!p->noutline && p->nlines >= 3) { /* the hull drawn dashed through the fairleads */
        fputs("<rect x=\"", out);
        putnum(out, kx);
        fputs("\" y=\"", out);
        putnum(out, y + 3);
        fputs("\" width=\"12\" height=\"10\" fill=\"" HULL_FILL "\" stroke=\"" INK
              "\" stroke-width=\"1.5\" stroke-dasharray=\"3 2\"/>\n",
              out);
        hf_svg_text(out, kx + 18, y + 12, 's', TICK_PX, 0, 0, "hull through the fairleads");
        y += 20;
    }
    if (p->has_load) {
        char dir[48], lab[80];
        hf_svg_direction_label(p->load_direction, dir, sizeof dir);
        snprintf(lab, sizeof lab, "load toward %s", dir);
        arrow(out, kx, y + 8, 1, 0, 22);
        hf_svg_text(out, kx + 28, y + 12, 's', TICK_PX, 1, 0, lab);
        clipped(out, kx + 28, y + 28, TICK_PX, 0, PL_W, p->load_label ? p->load_label : "load");
        hf_svg_text(out, kx + 28, y + 43, 's', 11, 0, 0, "(deg counter-clockwise from x)");
        y += 54;
    }
    hf_svg_text(out, kx, y + 18, 's', LABEL_PX, 1, 0, "Lines");
    y += 24;
    for (size_t i = 0; i < p->nlines; i++, y += 16)
        key_line(out, p, i, kx, y);
    return y;
}

hf_status hf_svg_figure_plan(FILE *out, const hf_svg_plan *p, int standalone, hf_error *err)
{
    double b[4];
    hf_svg_axes a;
    hf_status s = plan_check(p, b, err);
    if (s == HF_OK)
        s = plan_axes(&a, b, err);
    if (s != HF_OK)
        return s;
    /* the hull detail under the key; its frame, scale bar and notes below */
    double iy = fmax(PL_INSET_Y, 90 + 70 + (!p->noutline && p->nlines >= 3 ? 20 : 0) +
                                     (p->has_load ? 54 : 0) + 24 + 16.0 * p->nlines + 40);
    double H = fmax(a.top + a.height + 60, iy + PL_INSET + 90);
    hf_svg_begin(out, PL_W, H, p->title, standalone);
    title(out, PL_W, p->title);
    caption(out, 20, 48,
            p->noutline ? "Seen from above, global axes, true scale. Grey: hull outline."
                        : "Seen from above, global axes, true scale. Dashed: hull drawn "
                          "through the fairleads (no outline in the case).");
    hf_svg_axes_draw(out, &a, "global x (m)", "global y (m)", NULL);
    hull_shape(out, &a, p);
    plan_lines(out, p, &a);
    double rx = hf_svg_axes_px(&a, p->reference[0]), ry = hf_svg_axes_py(&a, p->reference[1]);
    mark(out, rx, ry, HF_SVG_DIAMOND, 9, INK);
    if (p->has_load)
        arrow(out, rx, ry, cos(p->load_direction), -sin(p->load_direction), 80); /* y down */
    plan_key(out, p);
    inset(out, p, iy);
    hf_svg_end(out);
    return HF_OK;
}

/* ---- (3) curves against offset ------------------------------------------ */

/* Per-line series in a row-major n x nlines block, scaled, drawn one by one
 * without a scratch array: a polyline per line with stride nlines. */
static void line_series(FILE *out, const hf_svg_axes *a, const double *x, const double *v, size_t n,
                        size_t nlines, double scale)
{
    for (size_t j = 0; j < nlines; j++)
        series(out, a, x, 1, v + j, nlines, n, scale, hf_svg_colour(j), 2, hf_svg_dash(j));
}

#define CV_PW 300.0 /* panel plot width */
#define CV_PH 200.0 /* panel plot height */

/* Panel k of the curve figure (0 force, 1 stiffness, 2 tension, 3
 * utilisation): its data range in the plotted units, axis label and title. */
static void curve_range(const hf_svg_curve *c, int k, double *lo, double *hi, const char **yl,
                        const char **tl)
{
    *lo = *hi = 0;
    if (k == 0) {
        span(c->force, 1, c->n, lo, hi);
        *lo /= 1e3;
        *hi /= 1e3;
        *yl = "restoring force (kN)";
        *tl = "Restoring force";
    } else if (k == 1) {
        span(c->stiffness, 1, c->n, lo, hi);
        *lo /= 1e3;
        *hi /= 1e3;
        *yl = "stiffness (kN/m)";
        *tl = "Stiffness";
    } else if (k == 2) {
        span(c->tension, 1, c->n * c->nlines, lo, hi);
        *lo = fmin(0.0, *lo / 1e3);
        *hi /= 1e3;
        if (c->tension_limit)
            for (size_t j = 0; j < c->nlines; j++)
                if (isfinite(c->tension_limit[j]) && c->tension_limit[j] > 0)
                    *hi = fmax(*hi, c->tension_limit[j] / 1e3);
        *yl = "line tension (kN)";
        *tl = "Tension of each line";
    } else {
        span(c->utilisation, 1, c->n * c->nlines, lo, hi);
        *lo = fmin(0.0, *lo * 100);
        *hi = fmax(*hi * 100, c->utilisation_limit * 100);
        *yl = "utilisation T/MBL (%)";
        *tl = "Utilisation of each line";
    }
}

/* A curve panel's series for the label test: v (n x nlines) scaled. */
typedef struct {
    const hf_svg_axes *a;
    const hf_svg_curve *c;
    const double *v;
    double scale;
} panel_data;

/* 1 when label box r is clear of every line's series of the panel. */
static int series_clear(const void *ctx, rect r)
{
    const panel_data *d = ctx;
    const hf_svg_curve *c = d->c;
    for (size_t j = 0; j < c->nlines; j++)
        for (size_t i = 0; i + 1 < c->n; i++) {
            double x0 = c->offset[i], x1 = c->offset[i + 1];
            double y0 = d->v[i * c->nlines + j] * d->scale;
            double y1 = d->v[(i + 1) * c->nlines + j] * d->scale;
            if (!isfinite(x0) || !isfinite(x1) || !isfinite(y0) || !isfinite(y1))
                continue;
            if (seg_meets(r, hf_svg_axes_px(d->a, x0), hf_svg_axes_py(d->a, y0),
                          hf_svg_axes_px(d->a, x1), hf_svg_axes_py(d->a, y1)))
                return 0;
        }
    return 1;
}

/* A reference line across panel a at y (plotted units), its label placed
 * clear of the panel's curves (v, scaled; ref_label). */
static void curve_hline(FILE *out, const hf_svg_axes *a, const hf_svg_curve *c, const double *v,
                        double scale, double y, const char *lab, int slot)
{
    if (!isfinite(y))
        return;
    double py = hf_svg_axes_py(a, y);
    seg(out, a->left, py, a->left + a->width, py, REFLINE, 1.5, "8 3 2 3");
    panel_data d = {a, c, v, scale};
    ref_label(out, a, py, lab, series_clear, &d, slot);
}

/* One reference line per distinct per-line allowed tension (up to 4). */
static void curve_tension_limits(FILE *out, const hf_svg_axes *a, const hf_svg_curve *c)
{
    double seen[4];
    int ns = 0;
    for (size_t j = 0; j < c->nlines && ns < 4; j++) {
        double v = c->tension_limit[j];
        int dup = 0;
        for (int q = 0; q < ns; q++)
            dup |= fabs(seen[q] - v) <= 1e-9 * fabs(v);
        if (dup || !isfinite(v) || v <= 0)
            continue;
        seen[ns++] = v;
        char lab[64];
        snprintf(lab, sizeof lab, "allowed %.4g kN", v / 1e3);
        curve_hline(out, a, c, c->tension, 1e-3, v / 1e3, lab, ns - 1);
    }
}

/* 1 when line j is overloaded at offset i: utilisation >= 1 (T >= MBL). */
static int curve_over(const hf_svg_curve *c, size_t i, size_t j)
{
    double u = c->utilisation[i * c->nlines + j];
    return isfinite(u) && u >= 1.0;
}

/* Number of overloaded (offset, line) points of c (0 without utilisations). */
static size_t curve_over_count(const hf_svg_curve *c)
{
    size_t k = 0;
    for (size_t i = 0; c->utilisation && i < c->n; i++)
        for (size_t j = 0; j < c->nlines; j++)
            k += curve_over(c, i, j);
    return k;
}

/* Crosses at the overloaded points on panel k (2 tension, 3 utilisation):
 * every one when n <= 60, else the first and the largest of each run. */
static void curve_overloads(FILE *out, const hf_svg_axes *a, const hf_svg_curve *c, int k)
{
    for (size_t j = 0; c->utilisation && j < c->nlines; j++) {
        for (size_t i = 0; i < c->n;) {
            if (!curve_over(c, i, j)) {
                i++;
                continue;
            }
            size_t e = i, top = i;
            for (; e < c->n && curve_over(c, e, j); e++)
                if (c->utilisation[e * c->nlines + j] > c->utilisation[top * c->nlines + j])
                    top = e;
            for (size_t q = i; q < e; q++) {
                double v = k == 2 ? c->tension[q * c->nlines + j] / 1e3
                                  : c->utilisation[q * c->nlines + j] * 100;
                if ((c->n > 60 && q != i && q != top) || !isfinite(v) || !isfinite(c->offset[q]))
                    continue;
                cross(out, hf_svg_axes_px(a, c->offset[q]), hf_svg_axes_py(a, v), 4.5);
            }
            i = e;
        }
    }
}

/* The data of panel k on its axes, with its limits. */
static void curve_data(FILE *out, const hf_svg_axes *a, const hf_svg_curve *c, int k)
{
    if (k == 0) {
        line_series(out, a, c->offset, c->force, c->n, 1, 1e-3);
    } else if (k == 1) {
        line_series(out, a, c->offset, c->stiffness, c->n, 1, 1e-3);
    } else if (k == 2) {
        line_series(out, a, c->offset, c->tension, c->n, c->nlines, 1e-3);
        if (c->tension_limit)
            curve_tension_limits(out, a, c);
        curve_overloads(out, a, c, k);
    } else {
        line_series(out, a, c->offset, c->utilisation, c->n, c->nlines, 100.0);
        if (c->utilisation_limit > 0) {
            char lab[64];
            snprintf(lab, sizeof lab, "limit %.4g %% (factor %.3g)", c->utilisation_limit * 100,
                     1.0 / c->utilisation_limit);
            curve_hline(out, a, c, c->utilisation, 100.0, c->utilisation_limit * 100, lab, 0);
        }
        curve_overloads(out, a, c, k);
    }
}

/* The legend of the lines at the right, cut to the figure's height H. */
static void curve_legend(FILE *out, const hf_svg_curve *c, double H)
{
    double lx = 90 + 2 * CV_PW + 100 + 30;
    hf_svg_text(out, lx, 90 - 12, 's', LABEL_PX, 1, 0, "Lines");
    size_t shown = c->nlines;
    double room = H - 100;
    size_t fit = (size_t)(room / 18.0);
    if (shown > fit)
        shown = fit > 1 ? fit - 1 : 0;
    hf_svg_legend(out, lx, 90, c->names, NULL, shown);
    double ny = 90 + 18.0 * (double)shown + 13;
    if (shown < c->nlines) {
        char more[64];
        snprintf(more, sizeof more, "... and %zu more", c->nlines - shown);
        hf_svg_text(out, lx, ny, 's', TICK_PX, 0, 0, more);
        ny += 18;
    }
    /* symmetric spreads draw equal curves on top of each other */
    hf_svg_text(out, lx, ny + 8, 's', 11, 0, 0, "Equal curves overlap:");
    hf_svg_text(out, lx, ny + 22, 's', 11, 0, 0, "the last listed is on top.");
    if (curve_over_count(c))
        key_overloaded(out, lx, ny + 32);
}

hf_status hf_svg_figure_curve(FILE *out, const hf_svg_curve *c, int standalone, hf_error *err)
{
    if (!c || c->n < 2 || !c->offset || !c->force)
        return hf_error_set(err, HF_EINVAL, "curve figure: expected >= 2 offsets with forces");
    if (c->nlines && !c->tension)
        return hf_error_set(err, HF_EINVAL, "curve figure: line tensions missing");
    if (!isfinite(c->utilisation_limit) || c->utilisation_limit < 0)
        return hf_error_set(err, HF_EINVAL, "curve figure: utilisation limit not finite");
    double x0 = 0, x1 = 0;
    if (span(c->offset, 1, c->n, &x0, &x1) < 2)
        return hf_error_set(err, HF_EINVAL, "curve figure: fewer than 2 finite offsets");
    /* panels: force, stiffness, tension, utilisation (those with data) */
    int have[4] = {1, c->stiffness != NULL, c->nlines > 0, c->nlines > 0 && c->utilisation};
    int np = have[0] + have[1] + have[2] + have[3];
    int rows = (np + 1) / 2;
    double W = 90 + CV_PW + 100 + CV_PW + 30 + (c->nlines ? 170 : 0);
    double H = 90 + rows * (CV_PH + 95);
    hf_svg_begin(out, W, H, c->title, standalone);
    title(out, W, c->title);
    caption(out, 20, 48,
            c->direction_label ? c->direction_label : "Against the hull offset from rest.");
    int slot = 0;
    for (int k = 0; k < 4; k++) {
        if (!have[k])
            continue;
        double left = 90 + (slot % 2) * (CV_PW + 100), top = 90 + (slot / 2) * (CV_PH + 95);
        slot++;
        double lo, hi;
        const char *yl, *tl;
        hf_svg_axes a;
        curve_range(c, k, &lo, &hi, &yl, &tl);
        hf_status s = hf_svg_axes_init(&a, left, top, CV_PW, CV_PH, x0, x1, lo, hi, 0, err);
        if (s != HF_OK) {
            hf_svg_end(out);
            return s;
        }
        hf_svg_axes_draw(out, &a, "offset (m)", yl, tl);
        curve_data(out, &a, c, k);
    }
    if (c->nlines)
        curve_legend(out, c, H);
    hf_svg_end(out);
    return HF_OK;
}

/* ---- (4) sweeps ------------------------------------------------------------ */

hf_status hf_svg_figure_sweep(FILE *out, const hf_svg_sweep *s, int standalone, hf_error *err)
{
    if (!s || s->n < 1 || s->ncurves < 1 || !s->x || !s->y)
        return hf_error_set(err, HF_EINVAL, "sweep figure: expected >= 1 curve of >= 1 point");
    if (s->has_limit && !isfinite(s->limit))
        return hf_error_set(err, HF_EINVAL, "sweep figure: limit not finite");
    double x0 = 0, x1 = 0, y0 = 0, y1 = 0;
    if (!span(s->x, 1, s->n, &x0, &x1) || !span(s->y, 1, s->n * s->ncurves, &y0, &y1))
        return hf_error_set(err, HF_EINVAL, "sweep figure: no finite point to plot");
    if (s->has_limit) {
        y0 = fmin(y0, s->limit);
        y1 = fmax(y1, s->limit);
    }
    double W = 880, H = 500;
    hf_svg_axes a;
    hf_status st = hf_svg_axes_init(&a, 100, 80, 540, 340, x0, x1, y0, y1, 0, err);
    if (st != HF_OK)
        return st;
    hf_svg_begin(out, W, H, s->title, standalone);
    title(out, W, s->title);
    hf_svg_axes_draw(out, &a, s->xlabel, s->ylabel, NULL);
    for (size_t c = 0; c < s->ncurves; c++) {
        hf_svg_polyline(out, &a, s->x, 1, s->y + c * s->n, 1, s->n, hf_svg_colour(c), 2,
                        hf_svg_dash(c));
        if (s->n <= 60)
            for (size_t i = 0; i < s->n; i++)
                if (isfinite(s->x[i]) && isfinite(s->y[c * s->n + i]))
                    mark(out, hf_svg_axes_px(&a, s->x[i]), hf_svg_axes_py(&a, s->y[c * s->n + i]),
                         HF_SVG_CIRCLE, 5, hf_svg_colour(c));
    }
    if (s->has_limit)
        hf_svg_hline(out, &a, s->limit, s->limit_label);
    if (s->ncurves > 1 || s->curve_names) {
        double lx = 670;
        if (s->legend_title)
            hf_svg_text(out, lx, 80 - 12, 's', LABEL_PX, 1, 0, s->legend_title);
        size_t fit = (size_t)((H - 100) / 18.0), shown = s->ncurves < fit ? s->ncurves : fit;
        hf_svg_legend(out, lx, 80, s->curve_names, NULL, shown);
    }
    hf_svg_end(out);
    return HF_OK;
}
