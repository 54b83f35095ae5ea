/* line.c - one mooring line: multi-section elastic catenary on a flat seabed
 * with axial Coulomb friction, clump weights and buoys (see docs/theory.md).
 *
 * Unknowns are the fairlead forces (H, V).  The forward map (H, V) -> (x, z)
 * walks the line from the fairlead to the anchor in closed form (Irvine 1981
 * for suspended sections; the grounded stretch with friction generalises
 * Jonkman 2007, NREL/TP-500-41958, eq. 2-4 to several sections), together
 * with its analytic Jacobian.  A damped 2x2 Newton solves the map; a nested
 * bracketing search (GSL Brent) is the fallback that always converges for
 * valid input.  Regimes with H = 0 (slack, vertical) are solved in closed
 * form before any iteration. */
#include <float.h>
#include <stddef.h>
#include <math.h>
#include <string.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include "holdfast/line.h"

#define NMAX HF_LINE_MAX_SECTIONS

static const char *const regime_names[] = {"suspended", "touchdown", "slack", "vertical", "laid"};

const char *hf_line_regime_name(hf_line_regime r)
{
    if ((unsigned)r > HF_LINE_LAID)
        return "unknown";
    return regime_names[r];
}

void hf_line_options_default(hf_line_options *o)
{
    o->rtol = 1e-10;
    o->max_iter = 40;
    o->max_backtrack = 40;
    o->max_bracket = 200;
    o->max_shrink = 60;
    o->max_polish = 20;
    o->max_laid = 200;
    o->ftol = 1e-7;
    o->max_refine = 4;
}

/* Options in range: rtol finite in (0, 1e-2), every limit >= 1. */
static int options_ok(const hf_line_options *o)
{
    return isfinite(o->rtol) && o->rtol > 0.0 && o->rtol < 1e-2 && isfinite(o->ftol) &&
           o->ftol > 0.0 && o->ftol < 1e-2 && o->max_iter >= 1 && o->max_backtrack >= 1 &&
           o->max_bracket >= 1 && o->max_shrink >= 1 && o->max_polish >= 1 && o->max_laid >= 1 &&
           o->max_refine >= 0;
}

/* sqrt(a^2 + b^2) without glibc hypot's cost; hypot only where squaring
 * could overflow (|a| or |b| above 1e150, far beyond any mooring force). */
static double mag(double a, double b)
{
    if (fabs(a) > 1e150 || fabs(b) > 1e150)
        return hypot(a, b);
    return sqrt(a * a + b * b);
}

static int finite_pos(double v)
{
    return isfinite(v) && v > 0.0;
}

hf_status hf_line_check(const hf_line *line, hf_error *err)
{
    if (!line)
        return hf_error_set(err, HF_EINVAL, "no line given");
    if (line->n < 1 || line->n > NMAX)
        return hf_error_set(err, HF_EINVAL, "a line needs 1 to %d sections, got %zu", NMAX,
                            line->n);
    if (line->slope != 0.0)
        return hf_error_set(err, HF_EUNSUPPORTED,
                            "a sloped seabed is not supported by this version of the line solver");
    for (size_t i = 0; i < line->n; i++) {
        const hf_section *s = &line->sec[i];
        if (!finite_pos(s->length))
            return hf_error_set(err, HF_EINVAL, "section %zu: length must be finite and > 0", i);
        if (!finite_pos(s->weight))
            return hf_error_set(err, HF_EINVAL,
                                "section %zu: wet weight must be finite and > 0 (sinking)", i);
        if (!finite_pos(s->ea))
            return hf_error_set(err, HF_EINVAL, "section %zu: EA must be finite and > 0", i);
        if (!finite_pos(s->mbl))
            return hf_error_set(err, HF_EINVAL, "section %zu: MBL must be finite and > 0", i);
        if (!isfinite(s->friction) || s->friction < 0.0)
            return hf_error_set(err, HF_EINVAL, "section %zu: friction must be finite and >= 0", i);
        if (s->strain[0] != 0.0 || s->strain[1] != 0.0 || s->strain[2] != 0.0)
            return hf_error_set(err, HF_EUNSUPPORTED,
                                "section %zu: a load-dependent stretch law is not supported by "
                                "this version of the line solver",
                                i);
        if (i + 1 < line->n) {
            const hf_joint *j = &line->joint[i];
            if (!isfinite(j->load))
                return hf_error_set(err, HF_EINVAL, "joint %zu: point load must be finite", i);
            if (!isfinite(j->friction) || j->friction < 0.0)
                return hf_error_set(err, HF_EINVAL, "joint %zu: friction must be finite and >= 0",
                                    i);
        }
    }
    return HF_OK;
}

double hf_line_length(const hf_line *line)
{
    double l = 0.0;
    for (size_t i = 0; i < line->n; i++)
        l += line->sec[i].length;
    return l;
}

/* Net vertical point load at joint i (0 for the ends). */
static double pload(const hf_line *line, size_t i)
{
    return i + 1 < line->n ? line->joint[i].load : 0.0;
}

/* max(v, 0) as a comparison (fmax is a library call without -ffinite-math-only). */
static double pos(double v)
{
    return v > 0.0 ? v : 0.0;
}

double hf_line_weight(const hf_line *line)
{
    double w = 0.0;
    for (size_t i = 0; i < line->n; i++)
        w += line->sec[i].weight * line->sec[i].length + pload(line, i);
    return w;
}

/* ------------------------------------------------------------------------
 * Closed-form pieces.  Stable forms avoid cancellation when H >> V (short
 * sections, taut lines): Tt - Tb = wL (Vt + Vb) / (Tt + Tb) and
 * asinh a - asinh b = asinh(a sqrt(1+b^2) - b sqrt(1+a^2)).
 * ---------------------------------------------------------------------- */

/* Suspended section of fixed unstretched length L with vertical force Vt at
 * its upper end and Vb = Vt - wL at its lower end (Irvine 1981, eq. 2.38-2.39
 * in section form).  Adds dx, dz and d(dx,dz)/d(H,Vt) into the accumulators.
 * Needs H > 0, or H == 0 with Vt, Vb > 0 (vertical hanging limit). */
static void suspended(double H, double w, double L, double EA, double Vt, double Vb, double *x,
                      double *z, double J[2][2])
{
    double Tt = mag(H, Vt), Tb = mag(H, Vb);
    double A, Q; /* A = (asinh(Vt/H) - asinh(Vb/H)) / w ;  Q = (Vt/Tt - Vb/Tb) / w */
    if ((Vt > 0.0 && Vb > 0.0) || (Vt < 0.0 && Vb < 0.0)) {
        double d = Vt * Tb + Vb * Tt;
        A = asinh(w * L * (Vt + Vb) / d) / w;
        Q = H * H * L * (Vt + Vb) / (d * Tt * Tb);
    } else {
        /* Vt >= 0 >= Vb here: asinh(Vt/H) = log((Vt + Tt)/H) and
         * -asinh(Vb/H) = log((Tb - Vb)/H), both free of cancellation. */
        A = (log((Vt + Tt) / H) + log((Tb - Vb) / H)) / w;
        Q = (Vt / Tt - Vb / Tb) / w;
    }
    double S = L * (Vt + Vb) / (Tt + Tb);                  /* = (Tt - Tb) / w */
    double C = -H * L * (Vt + Vb) / ((Tt + Tb) * Tt * Tb); /* = (H/w)(1/Tt - 1/Tb) */
    *x += H * A + H * L / EA;
    *z += S + L * (Vt + Vb) / (2.0 * EA);
    J[0][0] += A - Q + L / EA;
    J[0][1] += C;
    J[1][0] += C;
    J[1][1] += Q + L / EA;
}

/* The suspended piece of the touchdown section: V runs from 0 at the seabed
 * to Vt > 0, its length Vt/w follows V (Jonkman 2007, eq. 2-4 with L_B
 * moving).  Derivatives with respect to (H, V) at the fairlead. */
static void touchdown_piece(double H, double w, double EA, double Vt, double *x, double *z,
                            double J[2][2])
{
    double Tt = mag(H, Vt);
    double as = log((Vt + Tt) / H); /* asinh(Vt/H) for Vt > 0 */
    *x += (H / w) * as + H * Vt / (w * EA);
    *z += Vt * Vt / (w * (Tt + H)) + Vt * Vt / (2.0 * w * EA);
    J[0][0] += as / w - Vt / (w * Tt) + Vt / (w * EA);
    J[0][1] += H / (w * Tt) + H / (w * EA);
    J[1][0] += -Vt * Vt / (w * Tt * (Tt + H));
    J[1][1] += Vt / (w * Tt) + Vt / (w * EA);
}

/* Tension and its derivatives carried along the grounded part. */
typedef struct {
    double t, t_h, t_v; /* tension and d/dH, d/dV */
    double s, s_h, s_v; /* accumulated stretch and derivatives */
} ground_t;

/* A grounded piece of length l (dl/dV = l_v) with friction slope r = mu w:
 * tension falls by r per metre toward the anchor, never below zero.  Stretch
 * (T0 l - r l^2 / 2) / EA, or T0^2 / (2 r EA) once friction takes it all. */
static void ground_piece(ground_t *g, double l, double l_v, double r, double EA)
{
    if (l <= 0.0)
        return;
    if (g->t >= r * l) {
        g->s += (g->t * l - 0.5 * r * l * l) / EA;
        g->s_h += g->t_h * l / EA;
        g->s_v += (g->t_v * l + (g->t - r * l) * l_v) / EA;
        g->t -= r * l;
        g->t_v -= r * l_v;
    } else if (g->t > 0.0) {
        g->s += g->t * g->t / (2.0 * r * EA);
        g->s_h += g->t * g->t_h / (r * EA);
        g->s_v += g->t * g->t_v / (r * EA);
        g->t = g->t_h = g->t_v = 0.0;
    }
}

/* A point resting on the seabed with normal force N (dN/dV = n_v) and friction mu. */
static void ground_point(ground_t *g, double mu, double N, double n_v)
{
    double drop = mu * N;
    if (drop <= 0.0)
        return;
    if (g->t > drop) {
        g->t -= drop;
        g->t_v -= mu * n_v;
    } else {
        g->t = g->t_h = g->t_v = 0.0;
    }
}

/* Everything the walk learns, for the final state and the profile. */
typedef struct {
    double x, z, J[2][2];
    int grounded;                    /* 1 when part of the line rests on the seabed */
    int td_joint;                    /* touchdown exactly at joint td_sec (clump), else 0 */
    size_t td_sec;                   /* section holding the touchdown (or joint index) */
    double anchor_t;                 /* tension at the anchor after friction, N */
    double x_susp;                   /* horizontal extent of the suspended part, m */
    int buoy_down;                   /* a buoy lies on the seabed below touchdown */
    double sag_min;                  /* lowest sag point above the seabed, m (+inf if none) */
    double z_max;                    /* highest point above the seabed, m: a section top (the
                                      * fairlead or a buoy, where V drops going up) */
    double vb[NMAX], vt[NMAX];       /* V at the lower / upper end of each suspended piece */
    double gl[NMAX];                 /* grounded length of each section */
    double tg_lo[NMAX], tg_hi[NMAX]; /* tension at the lower / upper end of grounded pieces */
    /* Several seabed contacts (humps lifted by buoys off the grounded part): a
     * section is, from its lower end, a suspended bottom piece of length lb[k]
     * (the upper half of a hump, V rising from vbb[k] < 0 to 0, horizontal
     * force hb[k]), a grounded piece gl[k], and a suspended top piece (V from
     * vb[k] to vt[k], horizontal force ht[k]: H, or a hump's own H for the
     * lower half of a hump).  lb = 0 and ht = H on a line with one contact. */
    double ht[NMAX], lb[NMAX], vbb[NMAX], hb[NMAX];
    int unsupp;      /* 0, or why this (H, V) has no shape inside the model (UNSUPP_*) */
    double anchor_v; /* uplift at the anchor under a hump that lifts it, N (else 0) */
    int contacts;    /* seabed contacts: grounded stretches (humps split them) */
    int landed;      /* 1 when the top arc lands on a sag above a lower touchdown */
} walk_t;

/* Why a walk found no shape inside the model (walk_t.unsupp). */
enum { UNSUPP_NONE = 0, UNSUPP_SPILL = 2, UNSUPP_NO_ARC = 3 }; /* 1: a candidate without a shape */

/* Touchdown: the first point, going up from the anchor, where V becomes
 * positive (vt, vb: V at the top and bottom of each section).  Below it V
 * <= 0 (the line lies on the seabed); above it the line is suspended, with
 * sags where V changes sign again.  Sets w->grounded, td_sec, td_joint,
 * buoy_down and returns the first (partly) suspended section. */
static size_t find_touchdown(const hf_line *line, const double *vt, const double *vb, walk_t *w)
{
    size_t n = line->n;
    if (vb[0] > 0.0) {
        w->grounded = 0;
        return 0;
    }
    w->grounded = 1;
    int td_joint = 0;
    size_t k = 0;
    for (;;) {
        if (line->sec[k].weight > 0.0 && vt[k] > 0.0)
            break; /* touchdown inside section k */
        if (k + 1 >= n) {
            k = n; /* fully laid: touchdown at the fairlead */
            break;
        }
        if (pload(line, k) < 0.0)
            w->buoy_down = 1;
        if (vb[k + 1] > 0.0) {
            td_joint = 1; /* touchdown exactly at the clump on joint k */
            break;
        }
        k++;
    }
    w->td_sec = k;
    w->td_joint = td_joint;
    return td_joint ? k + 1 : k;
}

/* The suspended part from section k0 up, walked upward so sag heights are
 * known: adds into *x, *z, J and records V and the lowest sag in w. */
static void walk_suspended(const hf_line *line, double H, const double *vt, const double *vb,
                           size_t k0, walk_t *w, double *x, double *z, double J[2][2])
{
    for (size_t k = k0; k < line->n; k++) {
        const hf_section *s = &line->sec[k];
        double zb = *z;
        if (w->grounded && !w->td_joint && k == k0) {
            touchdown_piece(H, s->weight, s->ea, vt[k], x, z, J);
            w->vb[k] = 0.0;
        } else {
            if (k > k0 && vt[k - 1] <= 0.0 && vb[k] > 0.0)
                w->sag_min = fmin(w->sag_min, zb); /* kink minimum at a clump */
            suspended(H, s->weight, s->length, s->ea, vt[k], vb[k], x, z, J);
            w->vb[k] = vb[k];
            if (vb[k] < 0.0 && vt[k] > 0.0) {
                /* a sag's lowest point inside the section, where V = 0 */
                double xs = 0.0, zs = 0.0, Js[2][2] = {{0, 0}, {0, 0}};
                double lb = -vb[k] / s->weight;
                suspended(H, s->weight, lb, s->ea, 0.0, vb[k], &xs, &zs, Js);
                w->sag_min = fmin(w->sag_min, zb + zs);
            }
        }
        w->vt[k] = vt[k];
        if (*z > w->z_max) /* V grows going up inside a section: maxima sit at its top */
            w->z_max = *z;
    }
}

/* One whole grounded section k (and the joint below it, unless k = 0). */
static void ground_section(const hf_line *line, size_t k, ground_t *g, walk_t *w, double *xg)
{
    const hf_section *s = &line->sec[k];
    w->gl[k] = s->length;
    w->tg_hi[k] = g->t;
    ground_piece(g, s->length, 0.0, s->friction * s->weight, s->ea);
    w->tg_lo[k] = g->t;
    *xg += s->length;
    if (k > 0)
        ground_point(g, line->joint[k - 1].friction, pos(pload(line, k - 1)), 0.0);
}

/* The grounded part, walked from touchdown down to the anchor: tension,
 * stretch and their derivatives in *g, grounded length *xg (d/dV *xg_v). */
static void walk_grounded(const hf_line *line, const double *vt, walk_t *w, ground_t *g, double *xg,
                          double *xg_v)
{
    size_t k = w->td_sec, n = line->n;
    if (k >= n) {
        k = n - 1; /* fully laid: start with the top section, whole */
    } else if (w->td_joint) {
        /* The clump carries part of its weight on the seabed: N = P - V_above. */
        ground_point(g, line->joint[k].friction, -vt[k], -1.0);
    } else {
        const hf_section *s = &line->sec[k];
        double l = s->length - vt[k] / s->weight;
        w->gl[k] = l;
        w->tg_hi[k] = g->t;
        ground_piece(g, l, -1.0 / s->weight, s->friction * s->weight, s->ea);
        w->tg_lo[k] = g->t;
        *xg += l;
        *xg_v += -1.0 / s->weight;
        if (k == 0) {
            w->anchor_t = g->t;
            return;
        }
        ground_point(g, line->joint[k - 1].friction, pos(pload(line, k - 1)), 0.0);
        k--;
    }
    for (;; k--) {
        ground_section(line, k, g, w, xg);
        if (k == 0)
            break;
    }
    w->anchor_t = g->t;
}

/* ------------------------------------------------------------------------
 * Several seabed contacts (issue 15).  A buoy on the grounded part lifts a
 * hump: an arc that leaves the seabed with V = 0, rises to the buoy and
 * lands again with V = 0, its own horizontal force Hh being the tension the
 * friction leaves there.  Its net weight is zero (the lifted line weighs
 * what the buoy lifts: V1 + V2 = |P|, V1, V2 the vertical forces just below
 * and above the buoy) and it rises as much as it falls (both ends on the
 * seabed): rise1(V1, Hh) = rise2(V2, Hh), one equation in V1, solved to
 * machine precision by safeguarded Newton on [0, |P|].  Its derivatives
 * follow from the implicit function theorem, so the Jacobian stays exact.
 * ---------------------------------------------------------------------- */

/* The grounded length still available in the current section, from its
 * lower end up, and its derivatives with respect to the fairlead (H, V). */
typedef struct {
    double a, a_h, a_v;
} avail_t;

/* ground_piece for a length that depends on both H and V (l_h, l_v). */
static void ground_piece2(ground_t *g, double l, double l_h, double l_v, double r, double EA)
{
    if (l <= 0.0)
        return;
    if (g->t >= r * l) {
        g->s += (g->t * l - 0.5 * r * l * l) / EA;
        g->s_h += (g->t_h * l + (g->t - r * l) * l_h) / EA;
        g->s_v += (g->t_v * l + (g->t - r * l) * l_v) / EA;
        g->t -= r * l;
        g->t_h -= r * l_h;
        g->t_v -= r * l_v;
    } else if (g->t > 0.0) {
        g->s += g->t * g->t / (2.0 * r * EA);
        g->s_h += g->t * g->t_h / (r * EA);
        g->s_v += g->t * g->t_v / (r * EA);
        g->t = g->t_h = g->t_v = 0.0;
    }
}

/* A suspended piece whose V runs from 0 (on the seabed) to V >= 0, under
 * horizontal force H > 0 (Irvine 1981, section form): its rise
 * F = (T - H)/w + V^2/(2 w EA), its horizontal extent
 * X = (H/w) asinh(V/H) + H V/(w EA), and their partial derivatives. */
typedef struct {
    double f, f_v, f_h, x, x_v, x_h;
} piece_t;

static void half_arc(double H, double V, double w, double EA, piece_t *p)
{
    double T = mag(H, V);
    if (!(H > 0.0)) {
        /* H = 0 (friction has taken all tension): the piece hangs straight
         * up; no horizontal extent.  x_h is not needed (dH = 0 there). */
        p->f = V / w + V * V / (2.0 * w * EA);
        p->f_v = 1.0 / w + V / (w * EA);
        p->f_h = -1.0 / w;
        p->x = p->x_v = p->x_h = 0.0;
        return;
    }
    double as = log((V + T) / H);
    p->f = V * V / (w * (T + H)) + V * V / (2.0 * w * EA);
    p->f_v = V / (w * T) + V / (w * EA);
    p->f_h = -V * V / (w * T * (T + H));
    p->x = (H / w) * as + H * V / (w * EA);
    p->x_v = H / (w * T) + H / (w * EA);
    p->x_h = as / w - V / (w * T) + V / (w * EA);
}

typedef struct {
    double P;       /* buoy's net lift, N (> 0) */
    double w1, ea1; /* section below the buoy */
    double l1;      /* its length, m */
    double w2, ea2; /* section above */
    double r2;      /* friction slope above, N/m */
    double t_in;    /* tension entering the grounded piece above the hump, N */
    double a;       /* grounded length available above the buoy, m */
    int anchor;     /* 1: the hump takes all of section 0 and lifts the anchor's end */
} hump_in;

/* Horizontal force of the hump for V1: the tension left after friction
 * along g2 = a - (P - V1)/w2 (extended linearly for g2 < 0). */
static double hump_h(const hump_in *in, double V1)
{
    double g2 = in->a - (in->P - V1) / in->w2;
    double h = in->t_in - in->r2 * g2;
    return h > 0.0 ? h : 0.0;
}

/* The lower half of the hump (V from 0, or from V1 - w1 l1 at a lifted
 * anchor, up to V1) and the upper half (V from -(P - V1) to 0, rise taken
 * positive), both under H. */
static void hump_halves(const hump_in *in, double H, double V1, piece_t *p1, piece_t *p2)
{
    half_arc(H, V1, in->w1, in->ea1, p1);
    half_arc(H, in->P - V1, in->w2, in->ea2, p2);
    if (in->anchor) {
        piece_t q;
        half_arc(H, V1 - in->w1 * in->l1, in->w1, in->ea1, &q);
        p1->f -= q.f;
        p1->f_v -= q.f_v;
        p1->f_h -= q.f_h;
        p1->x -= q.x;
        p1->x_v -= q.x_v;
        p1->x_h -= q.x_h;
    }
}

/* Rise residual G(V1) = rise below the buoy - fall above it, and dG/dV1. */
static double hump_g(const hump_in *in, double V1, double *dg)
{
    double H = hump_h(in, V1);
    piece_t p1, p2;
    hump_halves(in, H, V1, &p1, &p2);
    double dh = H > 0.0 ? -in->r2 / in->w2 : 0.0;
    *dg = p1.f_v + p2.f_v + (p1.f_h - p2.f_h) * dh;
    return p1.f - p2.f;
}

/* Solves G(V1) = 0 on [lo, P], lo = 0 (or w1 l1 for a lifted anchor):
 * G(lo) < 0 < G(P) = rise1(P).  Newton steps, bisection whenever a step
 * leaves the bracket. */
static double hump_solve(const hump_in *in)
{
    double lo = in->anchor ? in->w1 * in->l1 : 0.0, hi = in->P;
    double v = in->P * in->w1 / (in->w1 + in->w2); /* the root of a stiff, frictionless hump */
    if (!(v > lo && v < hi))
        v = 0.5 * (lo + hi);
    for (int i = 0; i < 200; i++) {
        double dg, g = hump_g(in, v, &dg);
        if (g == 0.0)
            return v;
        if (g < 0.0)
            lo = v;
        else
            hi = v;
        double vn = v - g / dg;
        if (!(vn > lo && vn < hi) || !isfinite(vn))
            vn = 0.5 * (lo + hi);
        if (fabs(vn - v) <= 4.0 * DBL_EPSILON * in->P || hi - lo <= 4.0 * DBL_EPSILON * in->P)
            return vn;
        v = vn;
    }
    return v;
}

/* Records the hump's pieces in w (see walk_t) and its peak in z_max. */
static void hump_record(walk_t *w, const hump_in *in, size_t j, double V1, double Hh, double peak)
{
    double V2 = in->P - V1;
    w->lb[j + 1] = V2 / in->w2;
    w->vbb[j + 1] = -V2;
    w->hb[j + 1] = Hh;
    w->vb[j] = in->anchor ? V1 - in->w1 * in->l1 : 0.0;
    w->vt[j] = V1;
    w->ht[j] = Hh;
    if (peak > w->z_max)
        w->z_max = peak;
    w->contacts++;
}

/* The hump around the buoy on joint j, entered from above with the
 * grounded walk g and the length av still grounded in section j+1.  Adds
 * the grounded piece above the hump and the hump's span into *xg (with
 * derivatives), records the pieces in w, and sets av to what section j
 * keeps on the seabed.  A hump that needs more than section 0 lifts the
 * anchor's end (uplift V1 - w1 l1 > 0, w->anchor_v).  Returns 0, 1 when the
 * hump would reach the touchdown above (no such shape from this
 * touchdown), or UNSUPP_SPILL when it would pass joint j-1. */
static int hump(const hf_line *line, size_t j, ground_t *g, avail_t *av, walk_t *w, double *xg,
                double *xg_h, double *xg_v)
{
    const hf_section *s1 = &line->sec[j], *s2 = &line->sec[j + 1];
    hump_in in = {-line->joint[j].load,      s1->weight, s1->ea, s1->length, s2->weight, s2->ea,
                  s2->friction * s2->weight, g->t,       av->a,  0};
    double V1 = hump_solve(&in);
    if (V1 / in.w1 > s1->length) {
        if (j > 0)
            return UNSUPP_SPILL;
        in.anchor = 1;
        V1 = hump_solve(&in);
    }
    double V2 = in.P - V1, g2 = av->a - V2 / in.w2, Hh = hump_h(&in, V1);
    if (g2 < 0.0)
        return 1;
    /* Implicit derivatives of V1 with respect to the entering tension and
     * the available length: G(V1; t_in, a) = 0, Hh = t_in - r2 g2. */
    piece_t p1, p2;
    hump_halves(&in, Hh, V1, &p1, &p2);
    double D = Hh > 0.0 ? p1.f_h - p2.f_h : 0.0;
    double gv = p1.f_v + p2.f_v - D * in.r2 / in.w2;
    double v1_t = -D / gv, v1_a = in.r2 * D / gv;
    double v1_h = v1_t * g->t_h + v1_a * av->a_h, v1_v = v1_t * g->t_v + v1_a * av->a_v;
    double l_h = av->a_h + v1_h / in.w2, l_v = av->a_v + v1_v / in.w2;
    w->tg_hi[j + 1] = g->t;
    ground_piece2(g, g2, l_h, l_v, in.r2, s2->ea);
    w->tg_lo[j + 1] = g->t;
    w->gl[j + 1] += g2;
    /* g->t is now Hh (to rounding) with its derivatives */
    *xg += g2 + p1.x + p2.x;
    *xg_h += l_h + (p1.x_v - p2.x_v) * v1_h + (p1.x_h + p2.x_h) * g->t_h;
    *xg_v += l_v + (p1.x_v - p2.x_v) * v1_v + (p1.x_h + p2.x_h) * g->t_v;
    hump_record(w, &in, j, V1, Hh, p1.f);
    if (in.anchor) {
        w->anchor_v = V1 - in.w1 * in.l1;
        av->a = av->a_h = av->a_v = 0.0;
        return 0;
    }
    av->a = s1->length - V1 / in.w1;
    av->a_h = -v1_h / in.w1;
    av->a_v = -v1_v / in.w1;
    return 0;
}

/* The grounded part below the touchdown of the top arc, with a hump at
 * every buoy on it.  Returns 0, or hump()'s non-zero code. */
static int walk_ground_multi(const hf_line *line, const double *vt, walk_t *w, ground_t *g,
                             double *xg, double *xg_h, double *xg_v)
{
    size_t k = w->td_sec;
    avail_t av = {0.0, 0.0, 0.0};
    if (w->td_joint) {
        ground_point(g, line->joint[k].friction, -vt[k], -1.0);
        av.a = line->sec[k].length;
    } else {
        av.a = line->sec[k].length - vt[k] / line->sec[k].weight;
        av.a_v = -1.0 / line->sec[k].weight;
    }
    w->contacts = 1;
    for (;; k--) {
        const hf_section *s = &line->sec[k];
        double p = k > 0 ? pload(line, k - 1) : 0.0;
        if (p < 0.0) {
            int rc = hump(line, k - 1, g, &av, w, xg, xg_h, xg_v);
            if (rc != 0)
                return rc;
            continue;
        }
        w->tg_hi[k] = g->t;
        ground_piece2(g, av.a, av.a_h, av.a_v, s->friction * s->weight, s->ea);
        w->tg_lo[k] = g->t;
        w->gl[k] += av.a;
        *xg += av.a;
        *xg_h += av.a_h;
        *xg_v += av.a_v;
        if (k == 0)
            break;
        ground_point(g, line->joint[k - 1].friction, pos(p), 0.0);
        av.a = line->sec[k - 1].length;
        av.a_h = av.a_v = 0.0;
    }
    w->anchor_t = g->t;
    return 0;
}

/* Clears what a walk fills (the first n entries of each array). */
static void walk_reset(walk_t *w, size_t n, double H)
{
    w->grounded = w->td_joint = w->buoy_down = 0;
    w->unsupp = w->landed = 0;
    w->contacts = 0;
    w->td_sec = 0;
    w->anchor_t = w->anchor_v = 0.0;
    w->sag_min = INFINITY;
    w->z_max = 0.0;
    for (size_t k = 0; k < n; k++) {
        w->vb[k] = w->vt[k] = w->gl[k] = w->tg_lo[k] = w->tg_hi[k] = 0.0;
        w->lb[k] = w->vbb[k] = w->hb[k] = 0.0;
        w->ht[k] = H;
    }
}

/* The line with a single seabed contact (the lowest point where V turns
 * positive): its suspended part and its grounded part, buoys on the
 * grounded part ignored (flagged in buoy_down). */
static void walk_single(const hf_line *line, double H, const double *vt, const double *vb,
                        walk_t *w)
{
    walk_reset(w, line->n, H);
    size_t k0 = find_touchdown(line, vt, vb, w);
    double x = 0.0, z = 0.0;
    double J[2][2] = {{0.0, 0.0}, {0.0, 0.0}};
    walk_suspended(line, H, vt, vb, k0, w, &x, &z, J);
    ground_t g = {H, 1.0, 0.0, 0.0, 0.0, 0.0};
    double xg = 0.0, xg_v = 0.0;
    if (w->grounded) {
        walk_grounded(line, vt, w, &g, &xg, &xg_v);
        w->contacts = 1;
    }
    w->x_susp = x;
    w->x = x + xg + g.s;
    w->z = z;
    w->J[0][0] = J[0][0] + g.s_h;
    w->J[0][1] = J[0][1] + xg_v + g.s_v;
    w->J[1][0] = J[1][0];
    w->J[1][1] = J[1][1];
}

/* Is there a candidate touchdown of the top arc inside section k (at = 0)
 * or at joint k (at = 1)?  A candidate is where V, followed up from the
 * anchor, turns from <= 0 to > 0 (the anchor itself when V > 0 there). */
static int candidate(const hf_line *line, const double *vt, const double *vb, size_t k, int at)
{
    if (at == 0)
        return (k == 0 || vb[k] <= 0.0) && vt[k] > 0.0 && !(k == 0 && vb[0] > 0.0);
    return k + 1 < line->n && vt[k] <= 0.0 && vb[k + 1] > 0.0;
}

/* One candidate: the top arc from it (every sag at or above the seabed),
 * then the grounded part with its humps.  Returns 0 when the shape is
 * inside the model, 1 when this candidate has no shape (a sag below the
 * seabed, a hump reaching the touchdown), else an UNSUPP_* code. */
static int try_candidate(const hf_line *line, double H, const double *vt, const double *vb,
                         size_t k, int at, walk_t *w)
{
    walk_reset(w, line->n, H);
    int anchor = k == 0 && at == 0 && vb[0] > 0.0;
    w->grounded = !anchor;
    w->td_sec = k;
    w->td_joint = at;
    double x = 0.0, z = 0.0;
    double J[2][2] = {{0.0, 0.0}, {0.0, 0.0}};
    walk_suspended(line, H, vt, vb, at ? k + 1 : k, w, &x, &z, J);
    if (w->sag_min < 0.0)
        return 1;
    ground_t g = {H, 1.0, 0.0, 0.0, 0.0, 0.0};
    double xg = 0.0, xg_h = 0.0, xg_v = 0.0;
    if (w->grounded) {
        int rc = walk_ground_multi(line, vt, w, &g, &xg, &xg_h, &xg_v);
        if (rc != 0)
            return rc;
    }
    w->x_susp = x;
    w->x = x + xg + g.s;
    w->z = z;
    w->J[0][0] = J[0][0] + xg_h + g.s_h;
    w->J[0][1] = J[0][1] + xg_v + g.s_v;
    w->J[1][0] = J[1][0];
    w->J[1][1] = J[1][1];
    return 0;
}

/* Several contacts: the candidates from the anchor up; the first whose
 * shape is inside the model is the line (the longest top arc that stays
 * above the seabed: a sag lands only where a longer free arc would cut
 * into the seabed).  Returns 0, or why none is (UNSUPP_*). */
static int walk_multi(const hf_line *line, double H, const double *vt, const double *vb, walk_t *w)
{
    int why = 0, lowest = 1;
    for (size_t k = 0; k < line->n; k++)
        for (int at = 0; at < 2; at++) {
            if (!candidate(line, vt, vb, k, at))
                continue;
            int rc = try_candidate(line, H, vt, vb, k, at, w);
            if (rc == 0) {
                w->landed = !lowest;
                return 0;
            }
            if (rc > 1 && why == 0)
                why = rc;
            lowest = 0;
        }
    return why ? why : UNSUPP_NO_ARC;
}

/* The forward map.  Returns HF_OK, or HF_EINVAL when h is not > 0 and finite.
 * A line with one seabed contact is walked directly; buoys on the grounded
 * part or a sag below the seabed send it through the several-contact walk.
 * When no shape is inside the model the single-contact walk is kept (the
 * map stays defined for the solver) and w->unsupp says why. */
static hf_status walk(const hf_line *line, double H, double VF, walk_t *w)
{
    size_t n = line->n;
    if (!(H > 0.0) || !isfinite(H) || !isfinite(VF) || n < 1 || n > NMAX)
        return HF_EINVAL;
    double vt[NMAX], vb[NMAX];
    vt[0] = vb[0] = 0.0;
    double v = VF;
    for (size_t k = n; k-- > 0;) {
        vt[k] = v;
        vb[k] = v - line->sec[k].weight * line->sec[k].length;
        v = vb[k] - (k > 0 ? pload(line, k - 1) : 0.0);
    }
    walk_single(line, H, vt, vb, w);
    if (!w->buoy_down && !(w->sag_min < 0.0))
        return HF_OK;
    int why = walk_multi(line, H, vt, vb, w);
    if (why != 0) {
        walk_single(line, H, vt, vb, w);
        w->unsupp = why;
    }
    return HF_OK;
}

hf_status hf_line_span(const hf_line *line, double h, double v, double *x, double *z,
                       double jac[2][2])
{
    walk_t w;
    hf_status st = walk(line, h, v, &w);
    if (st != HF_OK)
        return st;
    *x = w.x;
    *z = w.z;
    memcpy(jac, w.J, sizeof w.J);
    return w.unsupp && (w.buoy_down || w.sag_min < 0.0) ? HF_EUNSUPPORTED : HF_OK;
}

/* ------------------------------------------------------------------------
 * H = 0: a line hanging straight down from the fairlead.
 * ---------------------------------------------------------------------- */

/* Column hanging from the fairlead whose lowest piece is the top `l` metres
 * of section k with vertical force v0 at its foot.  Returns the column's
 * height, the fairlead force *vf, the smallest force in it *vmin and
 * B = sum(length / EA) (dheight/dv0). */
static double column(const hf_line *line, size_t k, double l, double v0, double *vf, double *vmin,
                     double *B)
{
    const hf_section *s = &line->sec[k];
    double v = v0, h = 0.0, b = 0.0, vm = v0;
    h += l + (2.0 * v + s->weight * l) * l / (2.0 * s->ea);
    b += l / s->ea;
    v += s->weight * l;
    for (size_t j = k + 1; j < line->n; j++) {
        v += pload(line, j - 1);
        vm = fmin(vm, v);
        const hf_section *t = &line->sec[j];
        h += t->length + (2.0 * v + t->weight * t->length) * t->length / (2.0 * t->ea);
        b += t->length / t->ea;
        v += t->weight * t->length;
    }
    *vf = v;
    *vmin = vm;
    *B = b;
    return h;
}

typedef struct {
    int found;     /* 1: the line can hang with its foot on the seabed */
    double s_t;    /* grounded (laid) unstretched length below the column, m */
    double vf;     /* fairlead vertical force, N */
    double kvv;    /* dV/dZ, N/m */
    int bad;       /* the column would be in compression somewhere (buoy) */
    size_t foot;   /* section holding the column's foot (or joint index when at_joint) */
    int at_joint;  /* the foot is the clump on joint `foot`, partly on the seabed */
    double foot_l; /* hanging length of section `foot`, m (not at a joint) */
    double foot_p; /* part of the clump's weight the column carries, N (at a joint) */
} hang_t;

/* Finds the hanging configuration reaching height Z (Z > 0) with H = 0. */
static void hang(const hf_line *line, double Z, hang_t *r)
{
    size_t n = line->n;
    double vf, vmin, B;
    memset(r, 0, sizeof *r);
    if (column(line, 0, line->sec[0].length, 0.0, &vf, &vmin, &B) < Z)
        return; /* even the whole line hanging does not reach: taut */
    r->found = 1;
    double below = 0.0; /* length of the sections below section k */
    for (size_t k = 0; k < n; k++) {
        double gk1 = 0.0; /* height with the foot just above joint k (clump excluded) */
        if (k + 1 < n)
            gk1 = column(line, k + 1, line->sec[k + 1].length, 0.0, &vf, &vmin, &B);
        if (k + 1 < n && gk1 >= Z) {
            below += line->sec[k].length;
            continue;
        }
        /* The foot lies in section k or at joint k. */
        double vf0, vmin0, B0;
        double g0 = column(line, k, 0.0, 0.0, &vf0, &vmin0, &B0); /* foot at top of k, clump in */
        const hf_section *s = &line->sec[k];
        if (g0 <= Z) {
            /* Inside section k, l metres of it hanging: a l^2 + b l + c = 0. */
            double Ba = B0, w = s->weight;
            double a = w / (2.0 * s->ea), b = 1.0 + Ba * w, c = g0 - Z;
            double l = -2.0 * c / (b + sqrt(b * b - 4.0 * a * c));
            l = fmin(fmax(l, 0.0), s->length);
            column(line, k, l, 0.0, &r->vf, &vmin, &B);
            r->s_t = below + s->length - l;
            r->foot = k;
            r->foot_l = l;
            r->kvv = w / (1.0 + w * l / s->ea + Ba * w);
            r->bad = vmin < 0.0;
        } else {
            /* At the clump on joint k, the seabed carrying part of it. */
            double p = (Z - gk1) / B;
            column(line, k + 1, line->sec[k + 1].length, p, &r->vf, &vmin, &B);
            r->s_t = below + s->length;
            r->foot = k;
            r->at_joint = 1;
            r->foot_p = p;
            r->kvv = 1.0 / B;
            r->bad = vmin < 0.0 || p < 0.0;
        }
        /* A buoy on the laid part would lift it. */
        for (size_t j = 0; j + 1 < n && j < k; j++)
            if (pload(line, j) < 0.0)
                r->bad = 1;
        return;
    }
}

/* ------------------------------------------------------------------------
 * Filling the state.
 * ---------------------------------------------------------------------- */

static void sections_from_walk(const hf_line *line, const walk_t *w, double H, hf_line_state *st)
{
    (void)H; /* each piece carries its own horizontal force (w->ht, w->hb) */
    for (size_t k = 0; k < line->n; k++) {
        hf_section_result *r = &st->section[k];
        double top = line->sec[k].length - w->gl[k] - w->lb[k]; /* suspended top piece */
        double tlo, thi;
        if (top > 0.0)
            thi = mag(w->ht[k], w->vt[k]);
        else if (w->gl[k] > 0.0)
            thi = w->tg_hi[k];
        else
            thi = w->hb[k]; /* all of it the upper half of a hump: V = 0 at its top */
        if (w->lb[k] > 0.0)
            tlo = mag(w->hb[k], w->vbb[k]);
        else if (w->gl[k] > 0.0)
            tlo = w->tg_lo[k];
        else
            tlo = mag(w->ht[k], w->vb[k]);
        r->t_lower = tlo;
        r->t_upper = thi;
        /* T = sqrt(H^2 + V^2) with V linear along each suspended piece and
         * the grounded tension monotone: the maximum sits at an end. */
        r->t_max = tlo > thi ? tlo : thi;
        r->grounded = w->gl[k];
    }
}

/* Utilisations T_max / MBL and the most loaded section.  Returns 0 when a
 * utilisation cannot be represented (an MBL so small that T / MBL
 * overflows): the solve then refuses the line rather than print inf. */
static int finish_sections(const hf_line *line, hf_line_state *st)
{
    st->max_utilisation = 0.0;
    st->max_section = 0;
    for (size_t k = 0; k < line->n; k++) {
        hf_section_result *r = &st->section[k];
        r->utilisation = r->t_max / line->sec[k].mbl;
        if (!isfinite(r->utilisation))
            return 0;
        if (r->utilisation > st->max_utilisation) {
            st->max_utilisation = r->utilisation;
            st->max_section = k;
        }
    }
    return 1;
}

static void stiffness_from_flex(const double J[2][2], hf_line_state *st)
{
    double det = J[0][0] * J[1][1] - J[0][1] * J[1][0];
    if (det != 0.0 && isfinite(det)) {
        st->stiffness[0][0] = J[1][1] / det;
        st->stiffness[0][1] = -J[0][1] / det;
        st->stiffness[1][0] = -J[1][0] / det;
        st->stiffness[1][1] = J[0][0] / det;
    }
    for (int i = 0; i < 2; i++)
        for (int j = 0; j < 2; j++)
            if (!isfinite(st->stiffness[i][j]))
                st->stiffness[i][j] = 0.0;
}

/* Zeroes a state: the scalar part and the first n section results (the rest
 * of the array is never read; st->n bounds it). */
static void clear_state(hf_line_state *st, size_t n)
{
    memset(st, 0, offsetof(hf_line_state, section));
    memset(st->section, 0, (n <= NMAX ? n : NMAX) * sizeof st->section[0]);
}

void hf_line_state_copy(hf_line_state *dst, const hf_line_state *src)
{
    size_t n = src->n <= NMAX ? src->n : NMAX;
    memcpy(dst, src, offsetof(hf_line_state, section));
    memcpy(dst->section, src->section, n * sizeof src->section[0]);
}

static hf_status fail(hf_line_state *st, hf_status s, const char *msg)
{
    double x = st->x, z = st->z;
    size_t n = st->n;
    int it = st->iterations, ev = st->evaluations;
    clear_state(st, NMAX);
    st->x = x;
    st->z = z;
    st->n = n;
    st->iterations = it;
    st->evaluations = ev;
    st->status = s;
    st->message = msg;
    return s;
}

static const char msg_spill[] =
    "a buoy on the grounded line would lift a hump reaching past the next joint or the anchor; "
    "humps spanning more than the two sections beside their buoy are outside this model";
static const char msg_no_arc[] =
    "every touchdown the buoys allow either sags into the seabed or has a hump merging with "
    "the arc above it; this arrangement of buoys is outside the model";
static const char msg_laid_buoy[] =
    "a buoy would lift part of a line whose fairlead lies on the seabed; not supported";

/* The message for a walk's UNSUPP_* reason. */
static const char *unsupp_msg(int why)
{
    if (why == UNSUPP_SPILL)
        return msg_spill;
    return msg_no_arc;
}
static const char msg_buoy_search[] =
    "no shape with a single touchdown fits this line with its buoys (the buoys can lift "
    "stretches of it off the seabed in more than one way); not supported";
static const char msg_slack_buoy[] =
    "no shape fits: hanging slack, the line's buoy would lift part of it (a second seabed "
    "contact), and no taut shape with a single touchdown was found; not supported";

/* ------------------------------------------------------------------------
 * Newton on (H, V) with a backtracking line search; the driver owns the loop.
 * ---------------------------------------------------------------------- */

typedef struct {
    const hf_line *line;
    double X, Z, tol, scale;
    double H, V;
    walk_t buf[2]; /* storage of the two walks below */
    walk_t *w;     /* the walk at (H, V) */
    walk_t *trial; /* scratch for the line search; swapped with w on acceptance */
    double f;      /* merit: (rx^2 + rz^2) / scale^2 */
    int evals;
    int max_backtrack; /* line-search halvings per iteration (options) */
    double ferr;       /* estimated relative force error at the solution */
} newton_t;

static double merit(const newton_t *s, const walk_t *w)
{
    double rx = (w->x - s->X) / s->scale, rz = (w->z - s->Z) / s->scale;
    return rx * rx + rz * rz;
}

static hf_status newton_set(newton_t *s, double H, double V)
{
    s->H = H;
    s->V = V;
    s->evals++;
    if (walk(s->line, H, V, s->w) != HF_OK)
        return HF_EINVAL;
    s->f = merit(s, s->w);
    return isfinite(s->f) ? HF_OK : HF_EINVAL;
}

/* Convergence test: both residuals within tol (absolute, metres). */
static hf_status newton_test(const newton_t *s)
{
    return (fabs(s->w->x - s->X) <= s->tol && fabs(s->w->z - s->Z) <= s->tol) ? HF_OK : HF_CONTINUE;
}

/* The Newton correction (dH, dV) = -J^-1 r at the current walk.  Returns 0
 * when J is singular or the correction not finite. */
static int newton_dir(const newton_t *s, const walk_t *w, double *dH, double *dV)
{
    const double(*J)[2] = (const double(*)[2])w->J;
    double rx = w->x - s->X, rz = w->z - s->Z;
    double det = J[0][0] * J[1][1] - J[0][1] * J[1][0];
    if (!(fabs(det) > 0.0) || !isfinite(det))
        return 0;
    *dH = (-rx * J[1][1] + rz * J[0][1]) / det;
    *dV = (-rz * J[0][0] + rx * J[1][0]) / det;
    return isfinite(*dH) && isfinite(*dV);
}

/* Estimated relative error of the forces from the Newton correction (dH,
 * dV): max(|dH| / H, |dV| / T), T the fairlead tension (H relative to itself:
 * a nearly laid line has a tiny H that matters to its anchor). */
static double rel_error(const newton_t *s, double dH, double dV)
{
    double eh = fabs(dH) / s->H, ev = fabs(dV) / mag(s->H, s->V);
    return eh > ev ? eh : ev;
}

/* Converging on the forces as well as on the span (issue 12 item 14): where
 * the span is insensitive to the forces (a nearly laid line: tiny H moves x
 * by almost nothing) the span test holds while H is still off.  Full Newton
 * steps are taken while the estimated force error exceeds ftol and the span
 * stays within tolerance, at most max_refine of them; at the rounding floor
 * the correction is noise and the loop ends on the limit.  Leaves the
 * estimate at the final walk in s->ferr (+inf when J is singular). */
static void refine_forces(newton_t *s, double ftol, int max_refine)
{
    for (int i = 0;; i++) {
        double dH, dV;
        s->ferr = INFINITY;
        if (!newton_dir(s, s->w, &dH, &dV))
            return;
        s->ferr = rel_error(s, dH, dV);
        if (s->ferr <= ftol || i >= max_refine)
            return;
        double H = s->H + dH, V = s->V + dV;
        if (!(H > 0.0))
            return;
        s->evals++;
        if (walk(s->line, H, V, s->trial) != HF_OK)
            return;
        double f = merit(s, s->trial);
        if (!isfinite(f) || fabs(s->trial->x - s->X) > s->tol || fabs(s->trial->z - s->Z) > s->tol)
            return;
        s->H = H;
        s->V = V;
        walk_t *t = s->w;
        s->w = s->trial;
        s->trial = t;
        s->f = f;
    }
}

/* One damped Newton step.  HF_OK when it reduced the merit, HF_ENOCONV when
 * the step direction failed (singular Jacobian, no descent). */
static hf_status newton_iterate(newton_t *s)
{
    const double(*J)[2] = (const double(*)[2])s->w->J;
    double rx = s->w->x - s->X, rz = s->w->z - s->Z;
    double det = J[0][0] * J[1][1] - J[0][1] * J[1][0];
    if (!(fabs(det) > 0.0) || !isfinite(det))
        return HF_ENOCONV;
    double dH = (-rx * J[1][1] + rz * J[0][1]) / det;
    double dV = (-rz * J[0][0] + rx * J[1][0]) / det;
    if (!isfinite(dH) || !isfinite(dV))
        return HF_ENOCONV;
    double a = 1.0;
    if (s->H + dH < 0.1 * s->H)
        a = fmin(a, 0.9 * s->H / -dH); /* keep H > 0 */
    if (s->Z > 0.0 && s->V > 0.0 && s->V + a * dV < 0.1 * s->V)
        a = fmin(a, 0.9 * s->V / -dV); /* stay where the line is lifted */
    for (int i = 0; i < s->max_backtrack; i++, a *= 0.5) {
        double H = s->H + a * dH, V = s->V + a * dV;
        s->evals++;
        if (walk(s->line, H, V, s->trial) != HF_OK)
            continue;
        double f = merit(s, s->trial);
        if (isfinite(f) && f <= (1.0 - 1e-4 * a) * s->f) {
            s->H = H;
            s->V = V;
            /* accept: swap in the trial walk */
            walk_t *t = s->w;
            s->w = s->trial;
            s->trial = t;
            s->f = f;
            return HF_OK;
        }
    }
    return HF_ENOCONV;
}

/* ------------------------------------------------------------------------
 * Fallback: z is non-decreasing in V for fixed H and the span x(H, V(H)) is
 * increasing in H, so nested bracketing always finds the root.
 *
 * The two GSL Brent solvers live in storage inside the solve's own stack
 * frame (brent_t): gsl_root_fsolver is a public struct (gsl_roots.h) whose
 * state block has the size the solver type declares, so it is set up here
 * exactly as gsl_root_fsolver_alloc would, without the heap.  The solver
 * therefore allocates nothing at all and can never run out of memory.
 * ---------------------------------------------------------------------- */

typedef struct {
    gsl_root_fsolver s;
    union {
        double d[32];
        void *p[32];
        long double ld[16];
    } state; /* GSL's Brent state is 8 doubles in GSL 2.x: room to spare */
} brent_t;

/* Sets up b as a Brent solver.  -1 when this GSL's Brent state does not fit
 * (a different GSL build: reported, never a silent wrong result). */
static int brent_init(brent_t *b)
{
    const gsl_root_fsolver_type *T = gsl_root_fsolver_brent;
    if (T->size > sizeof b->state)
        return -1;
    b->s.type = T;
    b->s.function = NULL;
    b->s.root = b->s.x_lower = b->s.x_upper = 0.0;
    b->s.state = &b->state;
    return 0;
}

typedef struct {
    newton_t *s;
    double H;
    gsl_root_fsolver *inner; /* Brent solver for V at fixed H */
    const hf_line_options *opt;
} inner_t;

static double inner_f(double V, void *p)
{
    inner_t *in = p;
    walk_t w;
    in->s->evals++;
    if (walk(in->s->line, in->H, V, &w) != HF_OK)
        return NAN;
    return w.z - in->s->Z;
}

static int brent(gsl_root_fsolver *r, gsl_function *F, double lo, double hi, double xtol,
                 int max_iter, double *root)
{
    if (gsl_root_fsolver_set(r, F, lo, hi) != GSL_SUCCESS)
        return -1;
    for (int i = 0; i < max_iter; i++) {
        if (gsl_root_fsolver_iterate(r) != GSL_SUCCESS)
            return -1;
        double a = gsl_root_fsolver_x_lower(r), b = gsl_root_fsolver_x_upper(r);
        if (gsl_root_test_interval(a, b, xtol, 1e-13) == GSL_SUCCESS)
            break;
    }
    *root = gsl_root_fsolver_root(r);
    return 0;
}

/* V such that z(H, V) = Z. */
static int solve_v(inner_t *base, double H, double *V)
{
    newton_t *s = base->s;
    inner_t in = {s, H, base->inner, base->opt};
    gsl_function F = {inner_f, &in};
    double lo = 0.0, hi = fmax(fabs(hf_line_weight(s->line)), 1.0);
    double fhi = inner_f(hi, &in);
    for (int i = 0; i < base->opt->max_bracket && !(fhi >= 0.0); i++) {
        lo = hi;
        hi *= 2.0;
        fhi = inner_f(hi, &in);
    }
    if (!(fhi >= 0.0))
        return -1;
    if (fhi == 0.0) {
        *V = hi;
        return 0;
    }
    if (lo == 0.0) {
        /* The bracket must straddle the root: GSL reports an error otherwise
         * (and aborts a program that kept GSL's default handler).  z(H, 0) > Z
         * would need V < 0, which this search does not cover. */
        double flo = inner_f(0.0, &in);
        if (flo == 0.0) {
            *V = 0.0;
            return 0;
        }
        if (!(flo < 0.0))
            return -1;
    }
    return brent(in.inner, &F, lo, hi, 1e-14 * hi, base->opt->max_bracket, V);
}

static double outer_f(double H, void *p)
{
    inner_t *base = p;
    newton_t *s = base->s;
    double V;
    if (solve_v(base, H, &V) != 0)
        return NAN;
    walk_t w;
    s->evals++;
    if (walk(s->line, H, V, &w) != HF_OK)
        return NAN;
    return w.x - s->X;
}

static hf_status bracket(newton_t *s, inner_t *base, gsl_root_fsolver *outer)
{
    const hf_line_options *o = base->opt;
    gsl_function F = {outer_f, base};
    double wmax = 0.0;
    for (size_t k = 0; k < s->line->n; k++)
        wmax = fmax(wmax, s->line->sec[k].weight);
    double lo = 1e-9 * wmax * s->scale, hi = fmax(s->H, lo * 10.0);
    double flo = outer_f(lo, base);
    for (int i = 0; i < o->max_shrink && !(flo < 0.0); i++) {
        lo *= 1e-3;
        flo = outer_f(lo, base);
    }
    double fhi = outer_f(hi, base);
    for (int i = 0; i < o->max_bracket && !(fhi > 0.0); i++) {
        hi *= 2.0;
        fhi = outer_f(hi, base);
    }
    if (!(flo < 0.0) || !(fhi > 0.0))
        return HF_ENOCONV;
    double H, V;
    if (brent(outer, &F, lo, hi, 1e-13 * hi, o->max_bracket, &H) != 0 || solve_v(base, H, &V) != 0)
        return HF_ENOCONV;
    return newton_set(s, H, V);
}

/* The bracketing fallback.  HF_OK (s at the root), HF_ENOCONV, or HF_ENOMEM
 * when this GSL's Brent state does not fit the storage reserved for it. */
static hf_status fallback(newton_t *s, const hf_line_options *opt)
{
    brent_t outer, inner;
    if (brent_init(&outer) != 0 || brent_init(&inner) != 0)
        return HF_ENOMEM;
    inner_t base = {s, 0.0, &inner.s, opt};
    return bracket(s, &base, &outer.s);
}

/* Weight hanging below the fairlead over the top `ls` metres of line, N
 * (clumps and buoys included), for the touchdown start. */
static double hanging_weight(const hf_line *line, double ls)
{
    double left = ls, W = 0.0;
    for (size_t k = line->n; k-- > 0 && left > 0.0;) {
        double take = left < line->sec[k].length ? left : line->sec[k].length;
        W += take * line->sec[k].weight;
        left -= take;
        if (left > 0.0 && k > 0)
            W += line->joint[k - 1].load;
    }
    return W;
}

/* Start for a line partly on the seabed: the inextensible uniform catenary
 * with touchdown, X = L - Ls + a asinh(Ls/a), Ls = sqrt(Z^2 + 2 a Z), a = H/w
 * (Faltinsen 1990, Sea Loads on Ships and Offshore Structures, ch. 8 - from
 * memory), solved for a by safeguarded Newton, with w
 * the mean weight of the hanging length (a few fixed-point passes).  With
 * sqrt(a^2 + Ls^2) = a + Z: asinh(Ls/a) = log((Ls + a + Z)/a) and
 * f'(a) = log((Ls + a + Z)/a) - 2 Z / Ls.  Returns 0 when the line would not
 * touch down (then the caller uses the suspended-line start). */
static int touchdown_start(const hf_line *line, double X, double Z, double *H, double *V)
{
    double L = hf_line_length(line);
    if (!(Z > 0.0) || !(X > 0.0) || !(L > mag(X, Z)))
        return 0;
    double amax = (L * L - Z * Z) / (2.0 * Z); /* Ls = L: touchdown at the anchor */
    double fmax_ = amax * log((L + amax + Z) / amax) - X;
    if (!(fmax_ > 0.0))
        return 0; /* even touching down at the anchor is too short: suspended */
    double w = line->sec[line->n - 1].weight, a = 0.5 * amax, ls = 0.0;
    for (int pass = 0; pass < 3; pass++) {
        double lo = 0.0, hi = amax;
        for (int i = 0; i < 50; i++) {
            ls = sqrt(Z * Z + 2.0 * a * Z);
            double g = log((ls + a + Z) / a);
            double f = L - ls + a * g - X;
            if (f > 0.0)
                hi = a;
            else
                lo = a;
            double an = a - f / (g - 2.0 * Z / ls);
            if (!(an > lo && an < hi))
                an = 0.5 * (lo + hi);
            double da = fabs(an - a);
            a = an;
            if (da <= 1e-6 * a)
                break;
        }
        ls = sqrt(Z * Z + 2.0 * a * Z);
        double wn = hanging_weight(line, ls) / ls;
        if (!(wn > 0.0))
            return 0; /* buoyant top: no simple start */
        double dw = fabs(wn - w);
        w = wn;
        if (dw <= 1e-3 * w)
            break;
    }
    *H = w * a;
    *V = w * ls;
    return isfinite(*H) && isfinite(*V) && *H > 0.0;
}

/* Peyrot and Goulois (1979) starting point, with the mean weight of the line. */
static void peyrot(const hf_line *line, double X, double Z, double *H, double *V)
{
    double L = hf_line_length(line);
    double w = hf_line_weight(line) / L;
    if (!(w > 0.0)) {
        w = 0.0;
        for (size_t k = 0; k < line->n; k++)
            w += line->sec[k].weight * line->sec[k].length / L;
    }
    double lam;
    if (X <= 0.0)
        lam = 1e6;
    else if (X * X + Z * Z >= L * L)
        lam = 0.2;
    else
        lam = sqrt(3.0 * ((L * L - Z * Z) / (X * X) - 1.0));
    *H = fmax(fabs(w * X / (2.0 * lam)), 1e-6 * w * L);
    *V = 0.5 * w * (Z / tanh(lam) + L);
}

/* ------------------------------------------------------------------------
 * Regimes solved directly.
 * ---------------------------------------------------------------------- */

static hf_status solve_slack(const hf_line *line, const hang_t *hg, hf_line_state *st)
{
    if (hg->bad)
        return fail(st, HF_EUNSUPPORTED, msg_slack_buoy);
    st->regime = HF_LINE_SLACK;
    st->h = 0.0;
    st->v = hg->vf;
    st->tension = hg->vf;
    st->touchdown_x = st->x;
    st->grounded = hg->s_t;
    st->stiffness[1][1] = hg->kvv;
    /* Zero tension on the laid part; going up the column T = V grows by the
     * weight hanging below each point. */
    double v = 0.0;
    for (size_t k = 0; k < line->n; k++) {
        const hf_section *sec = &line->sec[k];
        hf_section_result *r = &st->section[k];
        if (k > 0 && (k > hg->foot + 1 || (k == hg->foot + 1 && !hg->at_joint)))
            v += pload(line, k - 1);
        if (k == hg->foot + 1 && hg->at_joint)
            v = hg->foot_p;
        double hanging;
        if (k < hg->foot || (k == hg->foot && hg->at_joint))
            hanging = 0.0;
        else if (k == hg->foot)
            hanging = hg->foot_l;
        else
            hanging = sec->length;
        r->grounded = sec->length - hanging;
        r->t_lower = hanging < sec->length ? 0.0 : v;
        v += sec->weight * hanging;
        r->t_upper = v;
        r->t_max = v;
    }
    return HF_OK;
}

static hf_status solve_vertical(const hf_line *line, double Z, hf_line_state *st)
{
    /* Z = sum L + sum L (Vt + Vb) / (2 EA) is linear in the fairlead force. */
    double c = 0.0, L = 0.0, B = 0.0, v = 0.0;
    for (size_t k = line->n; k-- > 0;) {
        const hf_section *s = &line->sec[k];
        double vb = v - s->weight * s->length; /* V offsets from VF */
        c += s->length * (v + vb) / (2.0 * s->ea);
        L += s->length;
        B += s->length / s->ea;
        v = vb - (k > 0 ? pload(line, k - 1) : 0.0);
    }
    double VF = (Z - L - c) / B;
    double vt = VF;
    double J[2][2] = {{0, 0}, {0, 0}}, x = 0.0, z = 0.0;
    for (size_t k = line->n; k-- > 0;) {
        const hf_section *s = &line->sec[k];
        double vb = vt - s->weight * s->length;
        if (!(vb > 0.0))
            return fail(st, HF_EUNSUPPORTED,
                        "a buoy would put part of a vertical line in compression; not supported");
        suspended(0.0, s->weight, s->length, s->ea, vt, vb, &x, &z, J);
        st->section[k].t_upper = vt;
        st->section[k].t_lower = vb;
        st->section[k].t_max = vt;
        vt = vb - (k > 0 ? pload(line, k - 1) : 0.0);
    }
    st->regime = HF_LINE_VERTICAL;
    st->h = 0.0;
    st->v = VF;
    st->tension = VF;
    st->anchor_v = st->section[0].t_lower;
    st->anchor_tension = st->anchor_v;
    st->anchor_angle = M_PI / 2.0;
    st->stiffness[0][0] = 1.0 / J[0][0]; /* pendulum-like lateral stiffness */
    st->stiffness[1][1] = 1.0 / B;
    st->residual = fabs(z - Z) / fmax(L, Z);
    return HF_OK;
}

/* Z = 0, X beyond the unstretched length: the whole line lies taut on the
 * seabed.  x = L + stretch(H), solved by Newton on H (monotone, convex). */
static hf_status solve_laid(const hf_line *line, double X, double tol, int max_iter,
                            hf_line_state *st)
{
    double H = fmax(line->sec[line->n - 1].ea * (X / hf_line_length(line) - 1.0), 1e-3);
    walk_t w;
    w.x = INFINITY; /* no walk yet: not converged */
    for (int i = 0; i < max_iter; i++) {
        if (walk(line, H, 0.0, &w) != HF_OK)
            break;
        st->evaluations++;
        st->iterations++;
        double r = w.x - X;
        if (fabs(r) <= tol)
            break;
        double Hn = H - r / w.J[0][0];
        H = Hn > 0.0 ? Hn : 0.5 * H;
    }
    if (fabs(w.x - X) > tol)
        return fail(st, HF_ENOCONV, "fully laid line: tension did not converge");
    if (w.buoy_down || w.unsupp || !w.grounded || w.td_sec < line->n || w.contacts > 1)
        return fail(st, HF_EUNSUPPORTED, msg_laid_buoy);
    st->regime = HF_LINE_LAID;
    st->h = H;
    st->v = 0.0;
    st->tension = H;
    st->anchor_h = w.anchor_t;
    st->anchor_tension = w.anchor_t;
    st->touchdown_x = X;
    st->grounded = hf_line_length(line);
    st->stiffness[0][0] = 1.0 / w.J[0][0];
    st->message = "fully laid line: its vertical stiffness is unbounded at lift-off and is "
                  "reported as 0";
    st->residual = fabs(w.x - X) / fmax(hf_line_length(line), X);
    sections_from_walk(line, &w, H, st);
    return HF_OK;
}

/* ------------------------------------------------------------------------
 * The driver: closed forms, start, Newton (with fallback), state.
 * ---------------------------------------------------------------------- */

/* The regimes solved without iterating on (H, V): hanging with H = 0
 * (slack), fully laid and slack, vertical (X = 0), laid and taut (Z = 0).
 * Returns 1 with *rc set when one of them applies, else 0; *slack_buoy is
 * set when a slack column exists only with a buoy in it. */
static int closed_forms(const hf_line *line, double X, double Z, double tol,
                        const hf_line_options *opt, hf_line_state *st, hf_status *rc,
                        int *slack_buoy)
{
    double L = hf_line_length(line);
    /* Could the line hang from the fairlead with at least X metres of it
     * laid on the seabed?  Cheap bound first: laid length <= L - Z / (1 +
     * max strain). */
    double wabs = 0.0, eamin = INFINITY;
    for (size_t k = 0; k < line->n; k++) {
        wabs += line->sec[k].weight * line->sec[k].length + fabs(pload(line, k));
        eamin = fmin(eamin, line->sec[k].ea);
    }
    if (Z > 0.0 && X <= L - Z / (1.0 + wabs / eamin) + tol) {
        hang_t hg;
        hang(line, Z, &hg);
        if (hg.found && X <= hg.s_t + tol) {
            if (!hg.bad) {
                *rc = solve_slack(line, &hg, st);
                return 1;
            }
            *slack_buoy = 1; /* no valid H = 0 column: look for a lifted (H > 0) shape */
        }
    }
    if (Z == 0.0 && X <= L + tol) {
        hang_t hg = {
            .found = 1, .s_t = L, .foot = line->n - 1, .kvv = line->sec[line->n - 1].weight};
        *rc = solve_slack(line, &hg, st); /* fully laid and slack: zero tension */
        return 1;
    }
    if (X == 0.0) {
        *rc = solve_vertical(line, Z, st);
        return 1;
    }
    if (Z == 0.0) {
        *rc = solve_laid(line, X, tol, opt->max_laid, st);
        return 1;
    }
    return 0;
}

/* Starting forces: a first-order predictor from a previous solution of the
 * same line, else the touchdown catenary, else Peyrot and Goulois. */
static void newton_start(const hf_line *line, double X, double Z, const hf_line_state *guess,
                         double *H0, double *V0)
{
    if (guess && guess->status == HF_OK && guess->h > 0.0 && isfinite(guess->h) &&
        isfinite(guess->v) && guess->n == line->n &&
        (guess->regime == HF_LINE_SUSPENDED || guess->regime == HF_LINE_TOUCHDOWN)) {
        /* First-order predictor from the previous solution's stiffness. */
        double dX = X - guess->x, dZ = Z - guess->z;
        *H0 = guess->h + guess->stiffness[0][0] * dX + guess->stiffness[0][1] * dZ;
        *V0 = guess->v + guess->stiffness[1][0] * dX + guess->stiffness[1][1] * dZ;
        if (!(*H0 > 0.1 * guess->h) || !isfinite(*H0) || !isfinite(*V0)) {
            *H0 = guess->h;
            *V0 = guess->v;
        }
    } else if (!touchdown_start(line, X, Z, H0, V0)) {
        peyrot(line, X, Z, H0, V0);
    }
}

/* Damped Newton from (H0, V0); when it fails, the bracketing fallback and
 * Newton polishing to full accuracy.  HF_OK with s at the solution, HF_ENOCONV,
 * or HF_ENOMEM (fallback storage, see brent_init).  *it counts iterations. */
static hf_status newton_solve(newton_t *s, const hf_line_options *opt, double H0, double V0,
                              int *it)
{
    hf_status ns = newton_set(s, H0, V0);
    if (ns != HF_OK) {
        peyrot(s->line, s->X, s->Z, &H0, &V0);
        ns = newton_set(s, H0, V0);
    }
    while (ns == HF_OK && newton_test(s) == HF_CONTINUE && *it < opt->max_iter) {
        ns = newton_iterate(s);
        (*it)++;
    }
    if (ns == HF_OK && newton_test(s) == HF_OK) {
        refine_forces(s, opt->ftol, opt->max_refine);
        return HF_OK;
    }
    ns = fallback(s, opt);
    for (int j = 0; ns == HF_OK && newton_test(s) == HF_CONTINUE && j < opt->max_polish;
         j++, (*it)++)
        if (newton_iterate(s) != HF_OK)
            break;
    if (ns == HF_OK && newton_test(s) != HF_OK)
        ns = HF_ENOCONV;
    if (ns == HF_OK)
        refine_forces(s, opt->ftol, opt->max_refine);
    return ns;
}

/* Damped Newton only, no fallback (the retries below): HF_OK at a root,
 * else HF_ENOCONV. */
static hf_status newton_plain(newton_t *s, const hf_line_options *opt, double H0, double V0,
                              int *it)
{
    hf_status ns = newton_set(s, H0, V0);
    int i = 0;
    while (ns == HF_OK && newton_test(s) == HF_CONTINUE && i < opt->max_iter) {
        ns = newton_iterate(s);
        i++;
    }
    *it += i;
    if (ns != HF_OK || newton_test(s) != HF_OK)
        return HF_ENOCONV;
    refine_forces(s, opt->ftol, opt->max_refine);
    return HF_OK;
}

/* Why the Newton path failed, for a line that has the shape searched for. */
static hf_status newton_failure(const hf_line *line, hf_status ns, int slack_buoy,
                                hf_line_state *st)
{
    if (ns == HF_ENOMEM)
        return fail(st, HF_ENOMEM,
                    "the line solver's fallback has no room for this GSL's Brent solver state");
    if (slack_buoy)
        return fail(st, HF_EUNSUPPORTED, msg_slack_buoy);
    for (size_t k = 0; k + 1 < line->n; k++)
        if (line->joint[k].load < 0.0)
            return fail(st, HF_EUNSUPPORTED, msg_buoy_search);
    return fail(st, HF_ENOCONV, "the line solver did not converge");
}

/* A shape was found but is outside the model: the status and message say
 * why, and h, v keep the forces of that shape so callers can say what was
 * found (issue 12 item 15). */
static hf_status refuse_found(hf_line_state *st, const char *msg, double H, double V)
{
    fail(st, HF_EUNSUPPORTED, msg);
    st->h = H;
    st->v = V;
    return HF_EUNSUPPORTED;
}

/* Fills st from the converged walk of a suspended or touchdown line. */
static hf_status state_from_walk(const hf_line *line, const newton_t *s, hf_line_state *st)
{
    const walk_t *w = s->w;
    if (w->unsupp && (w->buoy_down || w->sag_min < -s->tol))
        return refuse_found(st, unsupp_msg(w->unsupp), s->H, s->V);
    st->regime = w->grounded ? HF_LINE_TOUCHDOWN : HF_LINE_SUSPENDED;
    st->h = s->H;
    st->v = s->V;
    st->tension = mag(s->H, s->V);
    if (w->grounded) {
        st->anchor_h = w->anchor_t;
        st->anchor_v = w->anchor_v; /* 0 unless a hump lifts the anchor's end */
    } else {
        st->anchor_h = s->H;
        st->anchor_v = w->vb[0];
    }
    if (st->anchor_v == 0.0) {
        st->anchor_tension = st->anchor_h; /* anchor on the seabed: no uplift */
        st->anchor_angle = 0.0;
    } else {
        st->anchor_tension = mag(st->anchor_h, st->anchor_v);
        st->anchor_angle = atan2(st->anchor_v, st->anchor_h);
    }
    double gl = 0.0;
    for (size_t k = 0; k < line->n; k++)
        gl += w->gl[k];
    st->grounded = gl;
    if (w->grounded)
        st->touchdown_x = fmax(s->X - w->x_susp, 0.0); /* stretched grounded length */
    sections_from_walk(line, w, s->H, st);
    stiffness_from_flex(w->J, st);
    st->residual = fmax(fabs(w->x - s->X), fabs(w->z - s->Z)) / s->scale;
    st->z_max = w->z_max;
    st->force_error = isfinite(s->ferr) ? s->ferr : 1.0;
    return HF_OK;
}

static int has_buoy(const hf_line *line)
{
    for (size_t k = 0; k + 1 < line->n; k++)
        if (line->joint[k].load < 0.0)
            return 1;
    return 0;
}

/* Is the converged walk a shape inside the model?  Where the walk found
 * none (w->unsupp) it falls back on the single-contact map, whose roots are
 * then not equilibria of the line. */
static int shape_ok(const newton_t *s)
{
    const walk_t *w = s->w;
    return !(w->unsupp && (w->buoy_down || w->sag_min < -s->tol));
}

/* The line with every buoy's lift scaled by t (clumps kept). */
static void scale_buoys(const hf_line *line, hf_line *lc, double t)
{
    for (size_t k = 0; k + 1 < line->n; k++)
        if (line->joint[k].load < 0.0)
            lc->joint[k].load = t * line->joint[k].load;
}

/* Cold Newton on the line lc from its own start; HF_OK only for a shape
 * inside the model. */
static hf_status cold_on(newton_t *s, const hf_line_options *opt, int *it)
{
    double H0, V0;
    if (!touchdown_start(s->line, s->X, s->Z, &H0, &V0))
        peyrot(s->line, s->X, s->Z, &H0, &V0);
    hf_status r = newton_plain(s, opt, H0, V0, it);
    return r == HF_OK && shape_ok(s) ? HF_OK : HF_ENOCONV;
}

/* Continuation in the buoys' lift: the line is solved with every buoy's
 * lift scaled by t, from a t0 where a cold solve lands on a shape inside
 * the model (t0 = 0: no buoy, one seabed contact; else 1/2, 3/4, 9/10) to
 * t = 1, each step warm-started from the last; a step whose solve fails or
 * ends outside the model is halved (at most 30 steps).  Humps then grow
 * along a path of equilibria instead of being guessed.  HF_OK with s at the
 * solution of the real line, else HF_ENOCONV. */
static hf_status continuation(newton_t *s, const hf_line_options *opt, int *it)
{
    const hf_line *line = s->line;
    hf_line lc = *line;
    static const double t0s[4] = {0.0, 0.5, 0.75, 0.9};
    s->line = &lc;
    double t = -1.0, dt = 0.125;
    for (int i = 0; i < 4 && t < 0.0; i++) {
        scale_buoys(line, &lc, t0s[i]);
        if (cold_on(s, opt, it) == HF_OK)
            t = t0s[i];
    }
    for (int n = 0; t >= 0.0 && t < 1.0 && n < 30; n++) {
        double tn = t + dt < 1.0 ? t + dt : 1.0, Hp = s->H, Vp = s->V;
        scale_buoys(line, &lc, tn);
        hf_status ri = newton_plain(s, opt, Hp, Vp, it);
        if (ri == HF_OK && shape_ok(s)) {
            t = tn;
            dt *= 2.0;
        } else {
            dt *= 0.5;
            scale_buoys(line, &lc, t);
            if (newton_set(s, Hp, Vp) != HF_OK || dt < 1e-6)
                break;
        }
    }
    s->line = line;
    if (!(t >= 1.0))
        return HF_ENOCONV;
    return newton_set(s, s->H, s->V) == HF_OK && newton_test(s) == HF_OK && shape_ok(s)
               ? HF_OK
               : HF_ENOCONV;
}

/* Several seabed contacts make the map piecewise: Newton from one start
 * can end on a root of the single-contact fallback map (a shape outside
 * the model) or fail while an equilibrium exists.  Other starts are tried
 * in turn (the touchdown catenary, Peyrot and Goulois, each scaled by 1/4
 * and 4 in H); the first root that is a shape inside the model is kept.
 * Without one, the first outcome is restored so the refusal says what was
 * found.  Only lines with buoys ever get here with ns == HF_OK. */
static hf_status retry_starts(newton_t *s, const hf_line_options *opt, hf_status ns, int *it)
{
    double H1 = s->H, V1 = s->V, T0 = 0.0, U0 = 0.0, P0, Q0;
    int have_td = touchdown_start(s->line, s->X, s->Z, &T0, &U0);
    peyrot(s->line, s->X, s->Z, &P0, &Q0);
    const double starts[6][2] = {{T0, U0},        {P0, Q0},       {0.25 * T0, U0},
                                 {0.25 * P0, Q0}, {4.0 * T0, U0}, {4.0 * P0, Q0}};
    for (int i = 0; i < 6; i++) {
        if (i % 2 == 0 && !have_td)
            continue;
        hf_status r = newton_plain(s, opt, starts[i][0], starts[i][1], it);
        if (r == HF_OK && shape_ok(s))
            return HF_OK;
    }
    if (continuation(s, opt, it) == HF_OK)
        return HF_OK;
    if (ns == HF_OK)
        return newton_set(s, H1, V1) == HF_OK ? HF_OK : HF_ENOCONV;
    return ns;
}

/* Suspended or touchdown line: Newton on (H, V) from a start. */
static hf_status solve_general(const hf_line *line, double X, double Z, double scale,
                               const hf_line_state *guess, const hf_line_options *opt,
                               int slack_buoy, hf_line_state *st)
{
    newton_t s; /* not zero-initialised: its walks are large and filled before use */
    s.line = line;
    s.X = X;
    s.Z = Z;
    s.tol = opt->rtol * scale;
    s.scale = scale;
    s.evals = 0;
    s.max_backtrack = opt->max_backtrack;
    s.H = s.V = s.f = 0.0;
    s.ferr = INFINITY;
    s.w = &s.buf[0];
    s.trial = &s.buf[1];
    double H0, V0;
    int it = 0;
    newton_start(line, X, Z, guess, &H0, &V0);
    hf_status ns = newton_solve(&s, opt, H0, V0, &it);
    if ((ns != HF_OK && !slack_buoy && has_buoy(line)) || (ns == HF_OK && !shape_ok(&s))) {
        int mb = s.max_backtrack; /* retries: a short line search, many starts */
        s.max_backtrack = mb < 12 ? mb : 12;
        ns = retry_starts(&s, opt, ns, &it);
        s.max_backtrack = mb;
    }
    st->iterations = it;
    st->evaluations = s.evals;
    if (ns != HF_OK)
        return newton_failure(line, ns, slack_buoy, st);
    return state_from_walk(line, &s, st);
}

hf_status hf_line_solve(const hf_line *line, double X, double Z, const hf_line_state *guess,
                        const hf_line_options *opt, hf_line_state *st)
{
    hf_line_options defaults;
    if (!opt) {
        hf_line_options_default(&defaults);
        opt = &defaults;
    }
    clear_state(st, line && line->n <= NMAX ? line->n : NMAX);
    st->message = "";
    st->x = isfinite(X) ? X : 0.0;
    st->z = isfinite(Z) ? Z : 0.0;
    if (!options_ok(opt))
        return fail(st, HF_EINVAL,
                    "invalid line solver options (rtol, ftol in (0, 0.01), limits >= 1)");
    if (hf_line_check(line, NULL) != HF_OK)
        return fail(st, HF_EINVAL, "invalid line data (check lengths, weights, EA, MBL)");
    st->n = line->n;
    if (!isfinite(X) || !isfinite(Z) || X < 0.0)
        return fail(st, HF_EINVAL, "the span must be finite with X >= 0");
    if (Z < 0.0)
        return fail(st, HF_EINVAL, "the fairlead is below the seabed (Z < 0)");
    double L = hf_line_length(line), span = mag(X, Z);
    double scale = L > span ? L : span;
    hf_status rc = HF_OK;
    int slack_buoy = 0;
    if (!closed_forms(line, X, Z, opt->rtol * scale, opt, st, &rc, &slack_buoy))
        rc = solve_general(line, X, Z, scale, guess, opt, slack_buoy, st);
    if (rc != HF_OK)
        return rc;
    if (!finish_sections(line, st))
        return fail(st, HF_EINVAL,
                    "a section's MBL is too small for its tension: the utilisation T/MBL "
                    "overflows (check the breaking loads)");
    if (st->z_max < st->z)
        st->z_max = st->z; /* the fairlead is a point of the line */
    st->status = HF_OK;
    if (!st->message)
        st->message = "";
    return HF_OK;
}

/* ------------------------------------------------------------------------
 * Profile.
 * ---------------------------------------------------------------------- */

typedef struct {
    hf_line_point *pts;
    size_t cap, count;
} sink_t;

static void emit(sink_t *k, double arc, double x, double z, double t)
{
    if (k->count < k->cap) {
        hf_line_point *p = &k->pts[k->count];
        p->arc = arc;
        p->x = x;
        p->z = z;
        p->tension = t;
    }
    k->count++;
}

/* Number of equal steps no longer than `spacing` over `len`. */
static size_t steps(double len, double spacing)
{
    double n = ceil(len / spacing - 1e-9);
    if (!(n >= 1.0))
        return 1;
    if (n > 1e7)
        return 10000000;
    return (size_t)n;
}

/* Slack line: the laid part's true shape on the seabed is unknown, it is
 * drawn straight from the anchor to the point below the fairlead; the
 * hanging column above it is vertical. */
static void profile_slack(const hf_line *line, const hf_line_state *st, double spacing, sink_t *k)
{
    double arc = 0.0, z = 0.0;
    double sx = st->grounded > 0.0 ? st->x / st->grounded : 0.0;
    emit(k, 0.0, 0.0, 0.0, 0.0);
    for (size_t i = 0; i < line->n; i++) {
        const hf_section *s = &line->sec[i];
        const hf_section_result *r = &st->section[i];
        size_t m = steps(s->length, spacing);
        double gl = r->grounded;
        for (size_t j = 1; j <= m; j++) {
            double u = s->length * (double)j / (double)m;
            double a = arc + u;
            if (u <= gl) {
                emit(k, a, a * sx, 0.0, 0.0);
            } else {
                double h = u - gl, v0 = r->t_lower;
                double v = v0 + s->weight * h;
                double zz = z + h + (v0 + v) * h / (2.0 * s->ea);
                emit(k, a, st->x, zz, v);
            }
        }
        double h = s->length - gl;
        if (h > 0.0)
            z += h + (r->t_lower + r->t_upper) * h / (2.0 * s->ea);
        arc += s->length;
    }
}

/* Vertical line: straight up from the anchor. */
static void profile_vertical(const hf_line *line, const hf_line_state *st, double spacing,
                             sink_t *k)
{
    double arc = 0.0, z = 0.0;
    emit(k, 0.0, 0.0, 0.0, st->anchor_tension);
    for (size_t i = 0; i < line->n; i++) {
        const hf_section *s = &line->sec[i];
        double vb = st->section[i].t_lower;
        size_t m = steps(s->length, spacing);
        for (size_t j = 1; j <= m; j++) {
            double u = s->length * (double)j / (double)m;
            double v = vb + s->weight * u;
            emit(k, arc + u, 0.0, z + u + (vb + v) * u / (2.0 * s->ea), v);
        }
        z += s->length + (vb + st->section[i].t_upper) * s->length / (2.0 * s->ea);
        arc += s->length;
    }
}

/* Horizontal position where the grounded piece of length gl (tension thi at
 * its upper end, friction slope r) ends, starting from x0: gl plus the
 * stretch of its tensioned part. */
static double ground_end(double x0, double gl, double thi, double r, double ea)
{
    double u0 = r > 0.0 ? fmax(0.0, gl - thi / r) : 0.0; /* start of tension */
    double t0 = fmax(0.0, thi - r * (gl - u0));
    return x0 + (gl + (t0 + thi) * (gl - u0) / (2.0 * ea));
}

/* A suspended piece for the profile: suspended(), or for H = 0 (a hump on
 * a stretch friction has slackened) the vertical piece, x unchanged. */
static void piece(double H, double w, double L, double EA, double Vt, double Vb, double *x,
                  double *z)
{
    double Js[2][2] = {{0, 0}, {0, 0}};
    if (H > 0.0) {
        suspended(H, w, L, EA, Vt, Vb, x, z, Js);
        return;
    }
    double tt = fabs(Vt) + fabs(Vb);
    if (tt > 0.0)
        *z += L * (Vt + Vb) / tt + L * (Vt + Vb) / (2.0 * EA);
}

/* The upper half of a hump at the lower end of section i (w->lb[i] > 0):
 * the point at unstretched distance h <= lb from the section's lower end,
 * which sits at (x0, z0) on top of the buoy. */
static void hump_point(const hf_line *line, const walk_t *w, size_t i, double h, double x0,
                       double z0, double *x, double *z, double *t)
{
    const hf_section *s = &line->sec[i];
    double xs = 0.0, zs = 0.0;
    double vb = w->vbb[i], vt = vb + s->weight * h;
    if (h > 0.0)
        piece(w->hb[i], s->weight, h, s->ea, vt, vb, &xs, &zs);
    *x = x0 + xs;
    *z = z0 + zs;
    *t = hypot(w->hb[i], vt);
}

/* One sample at unstretched distance u from the lower end of section i,
 * whose lower end is at (x0, z0): on the upper half of a hump, on the
 * grounded piece or on the suspended top piece. */
static void profile_point(const hf_line *line, const walk_t *w, double H, size_t i, double u,
                          double x0, double z0, double arc, sink_t *k)
{
    (void)H; /* each piece has its own horizontal force */
    const hf_section *s = &line->sec[i];
    double lb = w->lb[i], gl = w->gl[i], r = s->friction * s->weight, thi = w->tg_hi[i];
    if (lb > 0.0) {
        double xh, zh, th;
        hump_point(line, w, i, u < lb ? u : lb, x0, z0, &xh, &zh, &th);
        if (u <= lb) {
            emit(k, arc + u, xh, zh, th);
            return;
        }
        x0 = xh; /* on the seabed again */
        z0 = 0.0;
        u -= lb;
        arc += lb;
    }
    if (u <= gl) {
        /* T(u) = max(0, thi - r (gl - u)); stretch integrated from 0 */
        double t = fmax(0.0, thi - r * (gl - u));
        double u0 = r > 0.0 ? fmax(0.0, gl - thi / r) : 0.0; /* start of tension */
        double st0 = 0.0;
        if (u > u0) {
            double t0 = fmax(0.0, thi - r * (gl - u0));
            st0 = (t0 + t) * (u - u0) / (2.0 * s->ea);
        }
        emit(k, arc + u, x0 + u + st0, 0.0, t);
        return;
    }
    double xs = 0.0, zs = 0.0;
    double h = u - gl, vb = w->vb[i];
    piece(w->ht[i], s->weight, h, s->ea, vb + s->weight * h, vb, &xs, &zs);
    double xbase = gl > 0.0 ? ground_end(x0, gl, thi, r, s->ea) : x0;
    emit(k, arc + u, xbase + xs, z0 + zs, hypot(w->ht[i], vb + s->weight * h));
}

/* Suspended or touchdown line: the walk at the solved forces, section by
 * section: hump piece, grounded piece, suspended top piece. */
static size_t profile_catenary(const hf_line *line, const hf_line_state *st, double spacing,
                               sink_t *k)
{
    walk_t w;
    double H = st->h, arc = 0.0, x = 0.0, z = 0.0;
    if (walk(line, H, st->v, &w) != HF_OK)
        return 0;
    emit(k, 0.0, 0.0, 0.0, st->anchor_tension);
    for (size_t i = 0; i < line->n; i++) {
        const hf_section *s = &line->sec[i];
        double gl = w.gl[i], lb = w.lb[i];
        size_t m = steps(s->length, spacing);
        for (size_t j = 1; j <= m; j++)
            profile_point(line, &w, H, i, s->length * (double)j / (double)m, x, z, arc, k);
        /* advance to the section's upper end */
        double xe = x, ze = z, th;
        if (lb > 0.0) {
            hump_point(line, &w, i, lb, x, z, &xe, &ze, &th);
            ze = 0.0;
        }
        if (gl > 0.0)
            xe = ground_end(xe, gl, w.tg_hi[i], s->friction * s->weight, s->ea);
        if (s->length - gl - lb > 0.0)
            piece(w.ht[i], s->weight, s->length - gl - lb, s->ea, w.vt[i], w.vb[i], &xe, &ze);
        x = xe;
        z = ze;
        arc += s->length;
    }
    return k->count;
}

size_t hf_line_profile(const hf_line *line, const hf_line_state *st, double spacing,
                       hf_line_point *pts, size_t cap)
{
    if (!st || st->status != HF_OK || !(spacing > 0.0) || !isfinite(spacing))
        return 0;
    sink_t k = {pts, cap, 0};
    if (st->regime == HF_LINE_SLACK) {
        profile_slack(line, st, spacing, &k);
        return k.count;
    }
    if (st->regime == HF_LINE_VERTICAL) {
        profile_vertical(line, st, spacing, &k);
        return k.count;
    }
    return profile_catenary(line, st, spacing, &k);
}
