/* svg.h - holdfast's own small plotting library: SVG figures of lines,
 * spreads, restoring curves and sweeps.
 *
 * Flow: case -> model -> line solve -> spread -> studies -> **writers**.
 * Two layers:
 *   1. Building blocks: a figure (hf_svg_begin/end), axes with round-number
 *      ticks (1-2-5 steps), the exposed data -> pixel mapping, polylines,
 *      markers, text (always XML-escaped), a legend, and a palette.
 *   2. Figures taking plain arrays and structs (no solving): the elevation
 *      of one line, the plan of a spread, curves against offset, sweeps.
 *
 * Look: white background, black text (13 px labels, 12 px ticks, 15 px
 * bold titles), open axes (left and bottom rules only) with outward ticks,
 * light dotted grid, lines 2 px.  Colours: the seven darker colours of the
 * Okabe & Ito (2008) colour-universal-design set ("Color Universal Design
 * (CUD): How to make figures and presentations that are friendly to
 * colorblind people", J*FLY), yellow left out because it vanishes on white;
 * after seven series the colours repeat with dashed, then dotted strokes, so
 * every series stays distinct in grey-scale print too.
 *
 * Every writer takes a FILE * and returns nothing but what the FILE records
 * (check ferror, or commit through outfile.h).  Figure functions validate
 * their input first and return HF_EINVAL with a message in err (err may be
 * NULL) before writing anything; they never allocate unless stated.
 * Non-finite values inside a data series are not plotted: the polyline is
 * broken there (a failed point of a curve shows as a gap). */
#ifndef HOLDFAST_SVG_H
#define HOLDFAST_SVG_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/line.h"
#include "holdfast/status.h"

/* ---- palette ---------------------------------------------------------- */

#define HF_SVG_NCOLOURS 7

/* Colour of series i (any i): "#rrggbb", Okabe & Ito (2008) order blue,
 * vermilion, bluish green, reddish purple, orange, sky blue, black. */
const char *hf_svg_colour(size_t i);

/* SVG stroke-dasharray of series i: "" (solid) for i < 7, then "7 4"
 * (dashed) for i < 14, "2 3" (dotted) for i < 21, and so on cyclically. */
const char *hf_svg_dash(size_t i);

/* Sequential colour scale for a value t in [0, 1] (clamped; NaN -> 0):
 * light sky blue -> blue -> dark indigo, monotonic in lightness so it reads
 * in grey-scale and for colour-blind readers.  Writes "#rrggbb" into
 * buf[8]. */
void hf_svg_scale_colour(double t, char buf[8]);

/* ---- ticks ------------------------------------------------------------ */

#define HF_SVG_MAX_TICKS 24

/* Axis ticks at round numbers: multiples of step = {1, 2, 5} x 10^k. */
typedef struct {
    double lo, hi; /* axis range: lo = first tick, hi = last tick */
    double step;   /* tick spacing */
    size_t n;      /* number of ticks, 2..HF_SVG_MAX_TICKS */
    long first;    /* tick i has the value (first + i) * step */
} hf_svg_ticks;

/* Chooses ticks covering [lo, hi] (either order) with about `target` (2..12)
 * intervals: among the three smallest steps {1, 2, 5} x 10^k not below
 * (hi - lo) / (target + 2) that give at most target + 2 intervals once the
 * range is widened outward to multiples of the step, the one that widens it
 * least (a tie goes to the interval count nearest the target).
 * A single value (hi == lo, or a span below 1e-9 of the magnitude) gets a
 * range around it: +-10 % of its magnitude, or -1..1 for zero (and for
 * magnitudes below 1e-300).  A data end within 1e-6 step beyond a tick is
 * taken as on it.  Returns
 * HF_OK, or HF_EINVAL when a bound is not finite or beyond +-1e300
 * (message in err). */
hf_status hf_svg_ticks_choose(double lo, double hi, int target, hf_svg_ticks *t, hf_error *err);

/* Value of tick i (exact multiple of the step; -0 is returned as 0). */
double hf_svg_tick_value(const hf_svg_ticks *t, size_t i);

/* Label of tick i into buf (cap >= 32): plain decimals with as many places
 * as the step needs ("0.25", "-150", "1200") when 1e-4 <= step and every
 * |value| < 1e7; otherwise a short exponent form ("2e-10", "1.5e9").
 * Labels of distinct ticks are distinct and parse back (strtod) to the tick
 * value within 1e-6 of the step. */
void hf_svg_tick_label(const hf_svg_ticks *t, size_t i, char *buf, size_t cap);

/* ---- axes and the data -> pixel mapping ------------------------------ */

typedef struct {
    double left, top, width, height; /* plot area in pixels (SVG y grows downward) */
    hf_svg_ticks xt, yt;             /* ticks; the data range is xt.lo..xt.hi, yt.lo..yt.hi */
} hf_svg_axes;

/* Sets up axes over a plot area (pixels) and data ranges [x0, x1], [y0, y1].
 * The number of ticks suits the area's size, and on the x axis it drops
 * until the tick labels fit side by side (about 7.4 px a character).
 * equal != 0 makes one data unit the same number of pixels on both axes (for
 * plans): the plot area shrinks in one direction and is centred.  Statuses as
 * hf_svg_ticks_choose, and HF_EINVAL for a non-positive or non-finite area. */
hf_status hf_svg_axes_init(hf_svg_axes *a, double left, double top, double width, double height,
                           double x0, double x1, double y0, double y1, int equal, hf_error *err);

/* The mapping: data x -> pixel column, data y -> pixel row, and back.
 * px = left + (x - xt.lo) / (xt.hi - xt.lo) * width,
 * py = top + height - (y - yt.lo) / (yt.hi - yt.lo) * height. */
double hf_svg_axes_px(const hf_svg_axes *a, double x);
double hf_svg_axes_py(const hf_svg_axes *a, double y);
double hf_svg_axes_data_x(const hf_svg_axes *a, double px);
double hf_svg_axes_data_y(const hf_svg_axes *a, double py);

/* Coordinates are written with two decimals (0.005 px), so a plotted point
 * maps back to its data within 0.005 px + the float error, well inside the
 * half-pixel promise. */

/* ---- drawing ---------------------------------------------------------- */

/* Starts an SVG document of width x height pixels with a white background,
 * the font defaults and a <title> (escaped; NULL for none).  `standalone`
 * non-zero writes the XML declaration too (a .svg file); zero writes only the
 * <svg> element (to inline in HTML). */
void hf_svg_begin(FILE *out, double width, double height, const char *title, int standalone);
void hf_svg_end(FILE *out);

/* Writes s with &, <, >, " and ' escaped, and control characters that XML
 * 1.0 forbids replaced by '?'.  NULL writes nothing. */
void hf_svg_escape(FILE *out, const char *s);

/* Text at pixel (x, y).  anchor: 's' start, 'm' middle, 'e' end.  size in
 * px; bold non-zero for bold; rotate in degrees (0 = horizontal). */
void hf_svg_text(FILE *out, double x, double y, char anchor, double size, int bold, double rotate,
                 const char *text);

/* Draws the axes: dotted grid, left and bottom rules, ticks with labels,
 * the axis labels (with units, e.g. "offset (m)") and an optional panel title
 * above the plot area. */
void hf_svg_axes_draw(FILE *out, const hf_svg_axes *a, const char *xlabel, const char *ylabel,
                      const char *title);

/* Draws n points (x[i*xstride], y[i*ystride]) as a polyline in data units
 * (strides of 0 mean 1), broken at non-finite values, in colour `colour`
 * ("#rrggbb"), stroke width in px, dash "" for solid.  With more than four
 * points per pixel column of the plot area, each column keeps only its
 * first, lowest, highest and last point (M4 aggregation: the same pixels
 * are drawn, the file stays small); every written point is a data point.
 * All figures draw their series through this rule. */
void hf_svg_polyline(FILE *out, const hf_svg_axes *a, const double *x, size_t xstride,
                     const double *y, size_t ystride, size_t n, const char *colour, double width,
                     const char *dash);

/* Marker shapes. */
typedef enum {
    HF_SVG_CIRCLE = 0,
    HF_SVG_SQUARE,
    HF_SVG_TRIANGLE, /* pointing down */
    HF_SVG_DIAMOND
} hf_svg_shape;

/* A marker at data (x, y), size px across, filled with `fill` and outlined
 * in black; with an optional label (escaped) offset (dx, dy) px from it. */
void hf_svg_marker(FILE *out, const hf_svg_axes *a, double x, double y, hf_svg_shape shape,
                   double size, const char *fill, const char *label, double dx, double dy);

/* A horizontal reference line across the plot area at data y, dashed dark
 * grey, with a label (escaped, may be NULL) at its right end inside the area. */
void hf_svg_hline(FILE *out, const hf_svg_axes *a, double y, const char *label);

/* A legend: n entries of a line sample and a name, top-left at pixel (x, y),
 * 18 px per entry.  Entry i uses hf_svg_colour(style[i]) and
 * hf_svg_dash(style[i]) (style NULL: entry i uses style i). */
void hf_svg_legend(FILE *out, double x, double y, const char *const *names, const size_t *style,
                   size_t n);

/* ---- figures ---------------------------------------------------------- */

/* One section of a line, for the elevation figure: where it ends along the
 * line and its strength. */
typedef struct {
    double end_arc; /* unstretched arc length from the anchor where the section ends, m */
    double mbl;     /* minimum breaking load, N (> 0), or 0 when not known */
    double allowed; /* allowed tension (MBL / required factor), N, or 0 = none */
} hf_svg_section;

/* Fills out[0..min(n, cap)) from a line's sections, anchor first: end_arc
 * the running sum of the unstretched lengths (m), mbl the section's MBL, and
 * allowed = mbl / required when required > 0 (the condition's required
 * factor MBL/T, hf_criteria_required), else 0.  Bookkeeping only, no
 * solving.  Returns the line's section count n (0 for a NULL line), so a
 * caller can size out; out may be NULL when cap is 0. */
size_t hf_svg_sections_from_line(const hf_line *line, double required, hf_svg_section *out,
                                 size_t cap);

/* (1) Elevation of one line in its vertical plane.  Top panel: the line
 * (coloured by tension on the sequential scale, with a labelled colour bar),
 * seabed, still water level, anchor, fairlead, touchdown.  Bottom panel:
 * tension (kN) against horizontal distance, with the allowed tension of each
 * section drawn as a dashed step line (its axis reaches the largest allowed
 * tension) and labelled with its value where there is room.  Points where
 * the tension reaches the MBL of their section (utilisation >= 1) are marked
 * with a cross on both panels, and a key entry "overloaded" is drawn.
 * Marker labels (anchor, touchdown, fairlead) are placed clear of the still
 * water level, the seabed and the line.
 * The vertical scale is exaggerated when the span is much longer than
 * deep (stated on the figure). */
typedef struct {
    const char *title;              /* e.g. "Line bow-port at rest" (escaped) */
    const hf_line_point *pts;       /* profile, anchor first (hf_line_profile) */
    size_t npts;                    /* >= 2 */
    double water_height;            /* still water level above the seabed, m (> 0) */
    int has_touchdown;              /* 1: mark touchdown at touchdown_x */
    double touchdown_x;             /* m from the anchor */
    double tension_limit;           /* N: one allowed tension (MBL / factor) for the whole
                                     * line, used when nsections is 0; 0 = none */
    size_t nsections;               /* 0: no section data */
    const hf_svg_section *sections; /* nsections, anchor first, end_arc increasing;
                                     * points beyond the last end belong to it */
    double seabed_slope;            /* sloped seabed (issue 15): its slope in the line's
                                     * plane, rad, rising from the anchor toward the
                                     * fairlead (hf_spread_geom.slope); 0 = flat.  The
                                     * overlay draws e[0]'s */
} hf_svg_elevation;

/* Writes figure (1).  standalone as in hf_svg_begin.  HF_EINVAL when a
 * value is not finite, npts < 2, water_height <= 0, or a section has a
 * negative MBL or allowed tension or its ends do not increase. */
hf_status hf_svg_figure_elevation(FILE *out, const hf_svg_elevation *e, int standalone,
                                  hf_error *err);

/* Figure (1) for a group of lines that share it (same make-up and geometry
 * up to a rotation about the vertical): e describes any one of them; the
 * figure states that it stands for each of the n names (escaped, n >= 1).
 * Statuses as hf_svg_figure_elevation, and HF_EINVAL for no names. */
hf_status hf_svg_figure_elevation_group(FILE *out, const hf_svg_elevation *e,
                                        const char *const *names, size_t n, int standalone,
                                        hf_error *err);

/* All lines overlaid in one elevation: each line in its own vertical plane,
 * anchor at distance 0, drawn in its series colour and dash (hf_svg_colour,
 * hf_svg_dash) with a legend of names; fairleads and touchdowns marked; a
 * tension panel with every line's tension against distance; overloaded
 * points (tension >= the section's MBL, from each e[i].sections) crossed,
 * with a key entry.  The still water level is e[0].water_height (the lines
 * share one site).  n >= 1; names NULL gives "line 1", ...  Statuses as
 * hf_svg_figure_elevation for each e[i] (the message names the line). */
hf_status hf_svg_figure_elevation_overlay(FILE *out, const char *title, const hf_svg_elevation *e,
                                          const char *const *names, size_t n, int standalone,
                                          hf_error *err);

/* A direction as figures print it: the angle in degrees reduced to
 * [0, 360), counter-clockwise from global x, "%.4g deg" ("270 deg" for
 * -pi/2); "?" for a non-finite angle.  cap >= 16. */
void hf_svg_direction_label(double rad, char *buf, size_t cap);

/* (2) Plan of a spread seen from above, global axes, equal scale: the hull
 * outline (polygon, light grey), or when none is given the convex hull of the
 * fairleads (drawn dashed, captioned); the lines as straight segments anchor
 * -> fairlead (a line's plane projects to a straight segment); anchors as
 * squares with names; broken lines dashed grey; the load direction as an
 * arrow from the reference point when given.  The key at the right lists
 * every line with its colour and dash, the broken-line and hull styles in
 * use, and the load direction in degrees (0-360, counter-clockwise from
 * global x).  A "hull detail" panel below the key shows the hull, its
 * fairleads and the first part of each line at a scale that shows them, with
 * a scale bar under its frame (where no line crosses it), and the hull at
 * rest (dashed) and the offset from rest when has_rest is set. */
typedef struct {
    const char *title;
    size_t nlines;               /* >= 1 */
    const char *const *names;    /* nlines names, or NULL */
    const double (*anchor)[2];   /* nlines global anchor x, y, m */
    const double (*fairlead)[2]; /* nlines global fairlead x, y, m */
    const unsigned char *broken; /* nlines flags (1 = broken), or NULL */
    size_t noutline;             /* 0: draw the hull through the fairleads */
    const double (*outline)[2];  /* noutline global polygon vertices, m */
    double reference[2];         /* global hull reference point, m */
    int has_load;                /* 1: draw the load arrow */
    double load_direction;       /* rad from global x, counterclockwise: where the load pushes */
    const char *load_label;      /* e.g. "storm: 550 kN" (escaped), or NULL */
    int has_rest;                /* 1: the rest pose below is shown in the hull detail */
    double rest_reference[2];    /* global reference point at rest, m */
    const double (*rest_outline)[2]; /* noutline global outline vertices at rest, or NULL */
} hf_svg_plan;

hf_status hf_svg_figure_plan(FILE *out, const hf_svg_plan *p, int standalone, hf_error *err);

/* (3) Against offset along one direction: four panels - restoring force
 * (kN), stiffness (kN/m), the tension of each line (kN) and its utilisation
 * (%) - sharing the offset axis, one legend for the lines.  The criterion
 * limit is drawn as a horizontal line on the utilisation panel (and on the
 * tension panel for each distinct per-line limit, up to 4).  Where a line's
 * utilisation reaches 1 (tension >= MBL) the point is crossed on the tension
 * and utilisation panels: every such point when n <= 60, else the first
 * point and the largest of each run of overloaded points; the legend then
 * gains an "overloaded" entry. */
typedef struct {
    const char *title;
    size_t n;                    /* offsets, >= 2 */
    const double *offset;        /* n, m */
    const double *force;         /* n, restoring force along the direction, N */
    const double *stiffness;     /* n, N/m, or NULL (panel omitted) */
    size_t nlines;               /* 0 omits the two line panels */
    const char *const *names;    /* nlines names, or NULL */
    const double *tension;       /* n x nlines, row-major: tension[i * nlines + j], N */
    const double *utilisation;   /* n x nlines, -, or NULL (panel omitted) */
    double utilisation_limit;    /* -, e.g. 1 / 1.67; 0 = none */
    const double *tension_limit; /* nlines allowed tensions, N, or NULL */
    const char *direction_label; /* e.g. "direction 30 deg" (format the angle with
                                  * hf_svg_direction_label), or NULL */
} hf_svg_curve;

hf_status hf_svg_figure_curve(FILE *out, const hf_svg_curve *c, int standalone, hf_error *err);

/* (4) A sweep: one output against one varied parameter, one curve per value
 * of a second parameter (or a single curve). */
typedef struct {
    const char *title;
    const char *xlabel;             /* with units, e.g. "depth (m)" */
    const char *ylabel;             /* with units, e.g. "max tension (kN)" */
    size_t n;                       /* points per curve, >= 1 */
    size_t ncurves;                 /* >= 1 */
    const double *x;                /* n x values (shared by every curve) */
    const double *y;                /* ncurves x n, row-major: y[c * n + i] */
    const char *const *curve_names; /* ncurves legend entries ("pretension = 450 kN"), or NULL */
    const char *legend_title;       /* e.g. "pretension", or NULL */
    int has_limit;                  /* 1: draw a horizontal limit at `limit` */
    double limit;                   /* in the y units plotted */
    const char *limit_label;
} hf_svg_sweep;

hf_status hf_svg_figure_sweep(FILE *out, const hf_svg_sweep *s, int standalone, hf_error *err);

#endif
