/* test_line.c - the single-line solver against outside references:
 * classical catenary identities, a hand calculation, the OC3 line,
 * an independent ODE integration of the cable equations (GSL odeiv2),
 * central differences, every regime, edge numbers and a randomised sweep. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include "support.h"
#include "holdfast/alloc.h"
#include "holdfast/line.h"

#define RELERR(a, b) (fabs((a) - (b)) / fmax(fabs(b), 1e-300))

static void no_nan(const hf_line_state *s)
{
    const double *v[] = {&s->x,
                         &s->z,
                         &s->h,
                         &s->v,
                         &s->tension,
                         &s->anchor_h,
                         &s->anchor_v,
                         &s->anchor_tension,
                         &s->anchor_angle,
                         &s->touchdown_x,
                         &s->grounded,
                         &s->residual,
                         &s->max_utilisation,
                         &s->stiffness[0][0],
                         &s->stiffness[0][1],
                         &s->stiffness[1][0],
                         &s->stiffness[1][1]};
    for (size_t i = 0; i < sizeof v / sizeof v[0]; i++)
        if (!isfinite(*v[i]))
            fail_msg("output field %zu is not finite (%g)", i, *v[i]);
    for (size_t k = 0; k < s->n; k++) {
        const hf_section_result *r = &s->section[k];
        if (!isfinite(r->t_lower) || !isfinite(r->t_upper) || !isfinite(r->t_max) ||
            !isfinite(r->utilisation) || !isfinite(r->grounded))
            fail_msg("section %zu result not finite", k);
    }
}

static hf_line one(double L, double w, double ea, double mu)
{
    hf_line l;
    hf_test_line_one(&l, L, w, ea, 5e6, mu);
    return l;
}

/* Classical catenary z = a cosh(x/a), a = H/w (inextensible limit, EA huge).
 * Identities (any statics text, e.g. Irvine, Cable Structures, 1981, ch. 1):
 * T = w z measured from the directrix; s = a tan(theta) from the vertex. */
static void test_catenary_identities(void **state)
{
    (void)state;
    const double w = 1137.25, a = 413.7; /* N/m, m */
    const double x1 = 57.3, x2 = 391.6;  /* abscissae of anchor and fairlead on the curve */
    double L = a * (sinh(x2 / a) - sinh(x1 / a));
    double X = x2 - x1, Z = a * (cosh(x2 / a) - cosh(x1 / a));
    hf_line line = one(L, w, 1e22, 0.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, X, Z, NULL, NULL, &s), HF_OK);
    no_nan(&s);
    assert_int_equal(s.regime, HF_LINE_SUSPENDED);
    assert_true(RELERR(s.h, w * a) < 1e-9);
    /* T at the fairlead = w * (height above the directrix) = w a cosh(x2/a) */
    assert_true(RELERR(s.tension, w * a * cosh(x2 / a)) < 1e-9);
    /* s = a tan(theta): arc from the vertex to the fairlead = a V/H */
    double arc = L + a * sinh(x1 / a);
    assert_true(RELERR(a * s.v / s.h, arc) < 1e-9);
    /* anchor uplift: V_A = w a sinh(x1/a), angle atan(sinh(x1/a)) */
    assert_true(RELERR(s.anchor_v, w * a * sinh(x1 / a)) < 1e-9);
    assert_true(RELERR(s.anchor_angle, atan(sinh(x1 / a))) < 1e-9);
}

/* Same identities with the vertex on the seabed and 211.4 m laid (mu = 0). */
static void test_catenary_touchdown(void **state)
{
    (void)state;
    const double w = 842.6, a = 918.3, x2 = 377.9, laid = 211.4;
    double sus = a * sinh(x2 / a);
    hf_line line = one(laid + sus, w, 1e22, 0.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, laid + x2, a * (cosh(x2 / a) - 1.0), NULL, NULL, &s),
                     HF_OK);
    no_nan(&s);
    assert_int_equal(s.regime, HF_LINE_TOUCHDOWN);
    assert_true(RELERR(s.h, w * a) < 1e-9);
    assert_true(RELERR(s.tension, w * a * cosh(x2 / a)) < 1e-9);
    assert_true(RELERR(s.grounded, laid) < 1e-9);
    assert_true(RELERR(s.touchdown_x, laid) < 1e-9);
    assert_true(RELERR(s.anchor_tension, w * a) < 1e-9); /* no friction: H reaches the anchor */
}

/* A hand calculation with the classical catenary identities (T = w y
 * measured from the directrix, suspended length s = sqrt(y^2 - a^2); any
 * statics text, e.g. Irvine, Cable Structures, 1981, ch. 1): an inextensible
 * line of wet weight 828 N/m in 25 m of water with a fairlead tension of
 * 1510 kN: a = T/w - d = 1798.67 m, suspended length sqrt(d^2 + 2 a d) =
 * 300.93 m, H = w a = 1489.3 kN (by hand, to the digits written). */
static void test_touchdown_hand_calculation(void **state)
{
    (void)state;
    const double w = 828.0, T = 1510e3, d = 25.0;
    double a = T / w - d;                   /* T = w (a + d), directrix identity */
    double sus = sqrt(d * d + 2.0 * a * d); /* suspended length */
    double L = 600.0;
    double X = (L - sus) + a * asinh(sus / a);
    hf_line line = one(L, w, 1e22, 0.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, X, d, NULL, NULL, &s), HF_OK);
    assert_true(fabs(s.tension - 1510e3) < 1.0);          /* N */
    assert_true(fabs((L - s.grounded) - 300.93) < 0.005); /* by hand, 2 decimals */
    assert_true(fabs(s.h - 1489.3e3) < 50.0);             /* by hand, 5 significant digits */
}

/* OC3 mooring line (Jonkman 2010, NREL/TP-500-47535): depth 320 m, fairlead
 * 70 m below SWL at radius 5.2 m, anchor radius 853.87 m, L 902.2 m,
 * w 698.094 N/m, EA 384,243,000 N.  The three lines together carry a
 * vertical mooring load of 1,607 kN at rest (value recalled from memory,
 * see REFERENCE.md section 2); forward check to 0.5 %. */
static void test_oc3_line(void **state)
{
    (void)state;
    hf_line line = one(902.2, 698.094, 384243000.0, 0.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 853.87 - 5.2, 320.0 - 70.0, NULL, NULL, &s), HF_OK);
    no_nan(&s);
    assert_int_equal(s.regime, HF_LINE_TOUCHDOWN);
    assert_true(RELERR(3.0 * s.v, 1607e3) < 0.005);
    /* friction only changes the grounded stretch, not the vertical load */
    hf_line line_mu = one(902.2, 698.094, 384243000.0, 1.0);
    hf_line_state s2;
    assert_int_equal(hf_line_solve(&line_mu, 853.87 - 5.2, 250.0, NULL, NULL, &s2), HF_OK);
    assert_true(RELERR(3.0 * s2.v, 1607e3) < 0.005);
    assert_true(s2.anchor_tension < s2.h);
}

/* --- independent model: integrate the cable's equilibrium equations ------ */

typedef struct {
    double w, ea;
} ode_par;

/* State (x, z, V) against unstretched arc s measured DOWN from the top of a
 * section; H constant.  dx/ds = -(H/T)(1 + T/EA), dz/ds = -(V/T)(1 + T/EA),
 * dV/ds = -w  (equilibrium of an element, Irvine 1981, eq. 2.1-2.3). */
static int cable_rhs(double s, const double y[], double f[], void *p)
{
    (void)s;
    const ode_par *q = p;
    double H = y[3], V = y[2];
    double T = hypot(H, V);
    f[0] = -(H / T) * (1.0 + T / q->ea);
    f[1] = -(V / T) * (1.0 + T / q->ea);
    f[2] = -q->w;
    f[3] = 0.0;
    return GSL_SUCCESS;
}

/* Grounded: state (x, T); dx/ds = -(1 + T/EA), dT/ds = -mu w while T > 0. */
static int ground_rhs(double s, const double y[], double f[], void *p)
{
    (void)s;
    const double *q = p; /* mu w, EA */
    double T = fmax(y[1], 0.0);
    f[0] = -(1.0 + T / q[1]);
    f[1] = -q[0]; /* integrated only while T > 0 */
    return GSL_SUCCESS;
}

static void integrate(gsl_odeiv2_system *sys, double *y, double len)
{
    gsl_odeiv2_driver *d =
        gsl_odeiv2_driver_alloc_y_new(sys, gsl_odeiv2_step_rk8pd, len * 1e-3, 1e-13, 1e-13);
    double s = 0.0;
    int rc = gsl_odeiv2_driver_apply(d, &s, len, y);
    if (rc != GSL_SUCCESS)
        fail_msg("ODE integration failed (%d) at s = %g of %g, y = %g %g", rc, s, len, y[0], y[1]);
    gsl_odeiv2_driver_free(d);
}

/* Walks down from the fairlead with the solver's H and V and checks that the
 * anchor is reached within 1e-6 of the span. */
static void check_by_ode(const hf_line *line, const hf_line_state *st)
{
    if (st->regime != HF_LINE_SUSPENDED && st->regime != HF_LINE_TOUCHDOWN)
        fail_msg("check_by_ode needs a suspended or touchdown line, got %s",
                 hf_line_regime_name(st->regime));
    double x = st->x, z = st->z, V = st->v, H = st->h, T = H;
    int grounded = 0;
    for (size_t k = line->n; k-- > 0;) {
        const hf_section *sec = &line->sec[k];
        double len = sec->length;
        if (!grounded) {
            double sus = len;
            ode_par p = {sec->weight, sec->ea};
            gsl_odeiv2_system sys = {cable_rhs, NULL, 4, &p};
            double y[4] = {x, z, V, H};
            if (V > 0.0 && V - sec->weight * len < 0.0) {
                /* V reaches zero: the lowest point of this stretch.  On the
                 * seabed it is the touchdown; above it, a sag to walk through. */
                double l0 = V / sec->weight;
                integrate(&sys, y, l0);
                if (fabs(y[1]) < 1e-6 * hypot(st->x, st->z) && st->regime == HF_LINE_TOUCHDOWN) {
                    grounded = 1;
                    sus = l0;
                } else {
                    assert_true(y[1] > 0.0); /* a sag stays above the seabed */
                    if (len - l0 > 0.0)
                        integrate(&sys, y, len - l0);
                }
            } else if (sus > 0.0) {
                integrate(&sys, y, sus);
            }
            x = y[0];
            z = y[1];
            V = y[2];
            len -= sus;
            if (grounded)
                T = H;
        }
        if (grounded && len > 0.0) {
            double q[2] = {sec->friction * sec->weight, sec->ea};
            gsl_odeiv2_system sys = {ground_rhs, NULL, 2, q};
            double y[2] = {x, T};
            /* integrate up to the event T = 0 (the RHS has a kink there) */
            double l1 = q[0] > 0.0 ? fmin(len, T / q[0]) : len;
            if (l1 > 0.0)
                integrate(&sys, y, l1);
            x = y[0] - (len - l1);
            T = l1 < len ? 0.0 : fmax(y[1], 0.0);
        }
        if (k > 0) {
            double P = line->joint[k - 1].load;
            if (!grounded) {
                if (V > 0.0 && V - P <= 0.0 && fabs(z) < 1e-6 * hypot(st->x, st->z) &&
                    st->regime == HF_LINE_TOUCHDOWN) {
                    grounded = 1; /* touchdown at the clump, seabed carries P - V */
                    T = fmax(H - line->joint[k - 1].friction * (P - V), 0.0);
                    assert_true(fabs(z) < 1e-6 * fmax(st->x, st->z) + 1e-9);
                } else {
                    V -= P;
                }
            } else {
                T = fmax(T - line->joint[k - 1].friction * P, 0.0);
            }
        }
    }
    double span = hypot(st->x, st->z);
    if (fabs(x) > 1e-6 * span || fabs(z) > 1e-6 * span)
        fail_msg("ODE walk ends %.3e, %.3e m from the anchor (span %.1f m)", x, z, span);
    if (st->regime == HF_LINE_TOUCHDOWN)
        assert_true(fabs(T - st->anchor_tension) <= 1e-6 * st->tension + 1e-6);
    else
        assert_true(fabs(V - st->anchor_v) <= 1e-6 * st->tension);
}

static hf_line three_with_clump(double mu)
{
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 3;
    l.sec[0] = (hf_section){312.5, 1136.0, 5.46e8, 6.1e6, mu, {0.0, 0.0, 0.0}}; /* chain */
    l.sec[1] = (hf_section){438.2, 165.3, 3.71e8, 5.3e6, 0.6, {0.0, 0.0, 0.0}}; /* wire */
    l.sec[2] = (hf_section){41.7, 1136.0, 5.46e8, 6.1e6, mu, {0.0, 0.0, 0.0}};  /* chain */
    l.joint[0] = (hf_joint){78.4e3, 1.0};                                       /* clump */
    return l;
}

static void test_ode_single(void **state)
{
    (void)state;
    hf_line line = one(902.2, 698.094, 384243000.0, 0.73);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 848.67, 250.0, NULL, NULL, &s), HF_OK);
    check_by_ode(&line, &s);
    /* fully suspended with uplift */
    assert_int_equal(hf_line_solve(&line, 870.3, 230.0, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_SUSPENDED);
    assert_true(s.anchor_v > 0.0);
    check_by_ode(&line, &s);
}

static void test_ode_multi(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.85);
    hf_line_state s;
    double Xs[] = {716.0, 737.0, 760.0, 781.0};
    for (size_t i = 0; i < 4; i++) {
        assert_int_equal(hf_line_solve(&line, Xs[i], 96.5, NULL, NULL, &s), HF_OK);
        no_nan(&s);
        check_by_ode(&line, &s);
    }
}

/* Touchdown exactly at the clump: choose X so that the line above the clump
 * carries less than the clump weight at the joint. */
static void test_touchdown_at_clump(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.85);
    line.joint[0].load = 400e3; /* a heavy clump holds the touchdown */
    hf_line_state s;
    int seen = 0;
    for (double X = 705.0; X <= 790.0; X += 2.5) {
        assert_int_equal(hf_line_solve(&line, X, 96.5, NULL, NULL, &s), HF_OK);
        no_nan(&s);
        check_by_ode(&line, &s);
        if (s.regime == HF_LINE_TOUCHDOWN && fabs(s.grounded - 312.5) < 1e-9)
            seen++;
    }
    assert_true(seen > 0);
}

/* Friction can take all of the tension before the anchor. */
static void test_friction_takes_all(void **state)
{
    (void)state;
    hf_line line = one(1400.0, 1450.0, 7.8e8, 1.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 1327.0, 80.0, NULL, NULL, &s), HF_OK);
    no_nan(&s);
    assert_int_equal(s.regime, HF_LINE_TOUCHDOWN);
    assert_true(s.h < 1.0 * 1450.0 * s.grounded);
    assert_true(s.anchor_tension == 0.0);
    check_by_ode(&line, &s);
}

/* Slack: more line than the span needs.  H = 0 and the hanging part is
 * vertical: V = w * hanging length with Z = l + w l^2/(2 EA). */
static void test_slack(void **state)
{
    (void)state;
    const double w = 1370.0, ea = 6.3e8, Z = 37.4;
    hf_line line = one(500.0, w, ea, 1.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 300.0, Z, NULL, NULL, &s), HF_OK);
    no_nan(&s);
    assert_int_equal(s.regime, HF_LINE_SLACK);
    assert_true(s.h == 0.0);
    double l = 2.0 * Z / (1.0 + sqrt(1.0 + 2.0 * w * Z / ea)); /* root of w l^2/(2EA) + l - Z */
    assert_true(RELERR(s.v, w * l) < 1e-12);
    assert_true(RELERR(s.grounded, 500.0 - l) < 1e-12);
    assert_true(RELERR(s.stiffness[1][1], w / (1.0 + w * l / ea)) < 1e-12);
    assert_string_equal(hf_line_regime_name(s.regime), "slack");
    hf_line_point pts[64];
    size_t np = hf_line_profile(&line, &s, 25.0, pts, 64);
    assert_true(np > 2 && np <= 64);
    assert_true(fabs(pts[np - 1].z - Z) < 1e-9);
    assert_true(fabs(pts[np - 1].x - 300.0) < 1e-9);
}

/* Height of the hanging column from the reported section tensions (Hooke's
 * law on each hanging piece, linear tension along it). */
static double column_height(const hf_line *line, const hf_line_state *s)
{
    double z = 0.0;
    for (size_t k = 0; k < line->n; k++) {
        double h = line->sec[k].length - s->section[k].grounded;
        z += h * (1.0 + (s->section[k].t_lower + s->section[k].t_upper) / (2.0 * line->sec[k].ea));
        /* tension grows by the weight of the hanging piece */
        assert_true(fabs(s->section[k].t_upper - s->section[k].t_lower - line->sec[k].weight * h) <=
                    1e-9 * fmax(s->v, 1.0));
    }
    return z;
}

/* Slack multi-section line with clumps: the foot inside a section, and the
 * foot exactly at a clump that the seabed partly carries. */
static void test_slack_clumps(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.85);
    line.sec[1].ea = 2.0e6; /* soft: the clump's share visibly stretches the column */
    hf_line_state s;
    double Zs[] = {20.0, 41.7, 41.7 + 0.4 * 438.2, 300.0};
    for (size_t i = 0; i < 4; i++) {
        assert_int_equal(hf_line_solve(&line, 50.0, Zs[i], NULL, NULL, &s), HF_OK);
        assert_int_equal(s.regime, HF_LINE_SLACK);
        no_nan(&s);
        assert_true(fabs(column_height(&line, &s) - Zs[i]) < 1e-9 * Zs[i]);
    }
    /* foot at the clump: heights between "clump hanging" and "clump resting" */
    double lo = 0.0, hi = 0.0;
    {
        /* column above the clump with no clump load, and with all of it */
        double v = 0.0;
        for (size_t k = 1; k < 3; k++) {
            double L = line.sec[k].length, w = line.sec[k].weight, ea = line.sec[k].ea;
            lo += L + (2 * v + w * L) * L / (2 * ea);
            hi += L + (2 * (v + 78.4e3) + w * L) * L / (2 * ea);
            v += w * L;
        }
    }
    double Z = 0.5 * (lo + hi);
    assert_int_equal(hf_line_solve(&line, 50.0, Z, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_SLACK);
    assert_true(fabs(s.grounded - 312.5) < 1e-9);
    double carried = s.section[1].t_lower; /* the column's share of the clump */
    assert_true(carried > 0.0 && carried < 78.4e3);
    assert_true(fabs(column_height(&line, &s) - Z) < 1e-9 * Z);
}

/* X = 0: slack vertical (line longer than Z) and taut vertical. */
static void test_vertical(void **state)
{
    (void)state;
    hf_line line = one(60.0, 512.0, 2.2e7, 1.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 0.0, 45.0, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_SLACK);
    no_nan(&s);
    /* taut: Z above the unstretched length; Hooke: Z = L + L (VF + VA)/(2 EA) */
    assert_int_equal(hf_line_solve(&line, 0.0, 60.35, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_VERTICAL);
    no_nan(&s);
    double va = (0.35 * 2.0 * 2.2e7 / 60.0 - 512.0 * 60.0) / 2.0;
    assert_true(RELERR(s.anchor_v, va) < 1e-10);
    assert_true(RELERR(s.v, va + 512.0 * 60.0) < 1e-10);
    assert_true(s.stiffness[0][0] > 0.0);
    assert_true(fabs(s.anchor_angle - M_PI / 2) < 1e-15);
}

/* Taut, strongly stretched fibre-like line with X^2 + Z^2 > L^2.  Straight
 * weightless limit: T = EA (chord/L - 1). */
static void test_taut_stretched(void **state)
{
    (void)state;
    hf_line line = one(1000.0, 2.1, 1.2e7, 0.6); /* light, soft */
    hf_line_state s;
    double X = 1040.0, Z = 300.0;
    assert_int_equal(hf_line_solve(&line, X, Z, NULL, NULL, &s), HF_OK);
    no_nan(&s);
    assert_int_equal(s.regime, HF_LINE_SUSPENDED);
    double chord = hypot(X, Z), Tstraight = 1.2e7 * (chord / 1000.0 - 1.0);
    assert_true(RELERR(s.tension, Tstraight) < 0.01); /* weight 2.1 kN over 1 km: ~1 % sag */
    assert_true(s.residual <= 1e-9);
}

/* Fully laid on a flat seabed (Z = 0), stretched beyond L, no friction:
 * H = EA (X/L - 1). */
static void test_laid(void **state)
{
    (void)state;
    hf_line line = one(200.0, 900.0, 4.0e8, 0.0);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 200.4, 0.0, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_LAID);
    assert_true(RELERR(s.h, 4.0e8 * (0.4 / 200.0)) < 1e-9);
    no_nan(&s);
    assert_int_equal(hf_line_solve(&line, 150.0, 0.0, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_SLACK);
    assert_true(s.h == 0.0 && s.v == 0.0);
}

/* A buoy on the laid part would lift it: reported, never a number. */
static void test_buoy_unsupported(void **state)
{
    (void)state;
    /* A buoy on the grounded line lifts a hump (tests/test_line_contact.c);
     * one whose hump would need more than the short pendant below it and
     * reach past the next joint is outside the model: refused, never a
     * number. */
    hf_line line;
    memset(&line, 0, sizeof line);
    line.n = 3;
    line.sec[0] = (hf_section){400.0, 1100.0, 5e8, 6e6, 1.0, {0.0, 0.0, 0.0}};
    line.sec[1] = (hf_section){20.0, 300.0, 3e8, 5e6, 0.6, {0.0, 0.0, 0.0}};
    line.sec[2] = (hf_section){350.0, 300.0, 3e8, 5e6, 0.6, {0.0, 0.0, 0.0}};
    line.joint[1] = (hf_joint){-80e3, 0.5};
    hf_line_state s;
    hf_status st = hf_line_solve(&line, 640.0, 60.0, NULL, NULL, &s);
    assert_int_equal(st, HF_EUNSUPPORTED);
    assert_int_equal(s.status, HF_EUNSUPPORTED);
    if (!strstr(s.message, "hump reaching past the next joint"))
        fail_msg("message \"%s\" does not say which shape is outside the model", s.message);
    /* results zeroed; h, v keep the refused shape's forces (line.h) */
    assert_true(s.tension == 0.0 && s.anchor_tension == 0.0 && s.h > 0.0);
    double x, z, J[2][2];
    assert_int_equal(hf_line_span(&line, s.h, s.v, &x, &z, J), HF_EUNSUPPORTED);
    /* the old refusal (a 60 kN buoy at a chain-wire joint on the seabed)
     * now solves; lifted clear of the seabed the same buoy is fine */
    line = three_with_clump(1.0);
    line.joint[0] = (hf_joint){-60e3, 0.5}; /* net lift */
    assert_int_equal(hf_line_solve(&line, 640.0, 96.5, NULL, NULL, &s), HF_OK);
    assert_true(s.regime == HF_LINE_TOUCHDOWN && s.residual <= 1e-9);
    st = hf_line_solve(&line, 785.0, 96.5, NULL, NULL, &s);
    assert_int_equal(st, HF_OK);
    check_by_ode(&line, &s);
}

/* A buoy holding part of the line up between a laid part and a sag (an
 * S-shaped "lazy wave"): supported while every sag stays above the seabed;
 * checked against the ODE walk, which finds the touchdown from z alone. */
static void test_lazy_wave(void **state)
{
    (void)state;
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 3;
    l.sec[0] = (hf_section){300.0, 1100.0, 5e8, 6e6, 1.0, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){200.0, 300.0, 3e8, 5e6, 0.6, {0.0, 0.0, 0.0}};
    l.sec[2] = (hf_section){250.0, 300.0, 3e8, 5e6, 0.6, {0.0, 0.0, 0.0}};
    l.joint[1] = (hf_joint){-120e3, 0.5};
    double Xs[] = {452.5, 537.0, 655.5, 731.0, 752.0};
    for (size_t i = 0; i < 5; i++) {
        hf_line_state s;
        assert_int_equal(hf_line_solve(&l, Xs[i], 120.0, NULL, NULL, &s), HF_OK);
        no_nan(&s);
        check_by_ode(&l, &s);
    }
}

static void test_bad_input(void **state)
{
    (void)state;
    hf_line line = one(100.0, 500.0, 1e8, 1.0);
    hf_line_state s;
    double bad[] = {NAN, INFINITY, -INFINITY, -1.0, HUGE_VAL};
    for (size_t i = 0; i < 5; i++) {
        assert_int_equal(hf_line_solve(&line, bad[i], 10.0, NULL, NULL, &s), HF_EINVAL);
        no_nan(&s);
    }
    assert_int_equal(hf_line_solve(&line, 50.0, -0.1, NULL, NULL, &s), HF_EINVAL);
    assert_int_equal(hf_line_solve(&line, 50.0, NAN, NULL, NULL, &s), HF_EINVAL);
    hf_line b = line;
    b.sec[0].length = 0.0;
    assert_int_equal(hf_line_solve(&b, 50.0, 10.0, NULL, NULL, &s), HF_EINVAL);
    b = line;
    b.sec[0].ea = strtod("1e309", NULL);
    assert_int_equal(hf_line_solve(&b, 50.0, 10.0, NULL, NULL, &s), HF_EINVAL);
    b = line;
    b.sec[0].weight = -2.0;
    assert_int_equal(hf_line_check(&b, NULL), HF_EINVAL);
    b = line;
    b.sec[0].friction = NAN;
    assert_int_equal(hf_line_check(&b, NULL), HF_EINVAL);
    b = line;
    b.n = 0;
    assert_int_equal(hf_line_check(&b, NULL), HF_EINVAL);
    b.n = HF_LINE_MAX_SECTIONS + 1;
    hf_error e;
    assert_int_equal(hf_line_check(&b, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "sections"));
    double x, z, J[2][2];
    assert_int_equal(hf_line_span(&line, 0.0, 10.0, &x, &z, J), HF_EINVAL);
    assert_int_equal(hf_line_span(&line, NAN, 10.0, &x, &z, J), HF_EINVAL);
    /* subnormal span and weight still give finite answers */
    assert_int_equal(hf_line_solve(&line, 4.9e-324, 10.0, NULL, NULL, &s), HF_OK);
    no_nan(&s);
}

/* The analytic flexibility against central differences of the span map. */
static void test_jacobian(void **state)
{
    (void)state;
    hf_line lines[2] = {one(902.2, 698.094, 384243000.0, 0.7), three_with_clump(0.85)};
    double hv[][2] = {{7.3e5, 5.1e5}, {1.21e6, 9.9e5}, {2.4e5, 1.3e5}, {6.6e5, 7.9e5}};
    for (int li = 0; li < 2; li++)
        for (int i = 0; i < 4; i++) {
            double H = hv[i][0], V = hv[i][1], x, z, J[2][2];
            assert_int_equal(hf_line_span(&lines[li], H, V, &x, &z, J), HF_OK);
            double dh = 1e-6 * H, dv = 1e-6 * V, xp, zp, xm, zm, Jd[2][2];
            hf_line_span(&lines[li], H + dh, V, &xp, &zp, Jd);
            hf_line_span(&lines[li], H - dh, V, &xm, &zm, Jd);
            double fd[2][2];
            fd[0][0] = (xp - xm) / (2 * dh);
            fd[1][0] = (zp - zm) / (2 * dh);
            hf_line_span(&lines[li], H, V + dv, &xp, &zp, Jd);
            hf_line_span(&lines[li], H, V - dv, &xm, &zm, Jd);
            fd[0][1] = (xp - xm) / (2 * dv);
            fd[1][1] = (zp - zm) / (2 * dv);
            double norm = fmax(fabs(J[0][0]), fabs(J[1][1]));
            for (int r = 0; r < 2; r++)
                for (int c = 0; c < 2; c++)
                    if (fabs(J[r][c] - fd[r][c]) > 1e-6 * norm)
                        fail_msg("line %d point %d J[%d][%d] = %.9e, differences %.9e", li, i, r, c,
                                 J[r][c], fd[r][c]);
        }
}

/* The solved stiffness against differences of full solves. */
static void test_stiffness(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.85);
    double X = 731.4, Z = 96.5, d = 1e-3;
    hf_line_state s, p, m;
    assert_int_equal(hf_line_solve(&line, X, Z, NULL, NULL, &s), HF_OK);
    assert_int_equal(hf_line_solve(&line, X + d, Z, &s, NULL, &p), HF_OK);
    assert_int_equal(hf_line_solve(&line, X - d, Z, &s, NULL, &m), HF_OK);
    double kHX = (p.h - m.h) / (2 * d), kVX = (p.v - m.v) / (2 * d);
    assert_true(RELERR(s.stiffness[0][0], kHX) < 1e-5);
    assert_true(RELERR(s.stiffness[1][0], kVX) < 1e-5);
    assert_int_equal(hf_line_solve(&line, X, Z + d, &s, NULL, &p), HF_OK);
    assert_int_equal(hf_line_solve(&line, X, Z - d, &s, NULL, &m), HF_OK);
    assert_true(RELERR(s.stiffness[0][1], (p.h - m.h) / (2 * d)) < 1e-5);
    assert_true(RELERR(s.stiffness[1][1], (p.v - m.v) / (2 * d)) < 1e-5);
}

static void test_warm_start(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.85);
    hf_line_state cold, warm;
    assert_int_equal(hf_line_solve(&line, 731.4, 96.5, NULL, NULL, &cold), HF_OK);
    assert_int_equal(hf_line_solve(&line, 731.9, 96.5, &cold, NULL, &warm), HF_OK);
    assert_true(warm.iterations <= 3);
    assert_true(warm.iterations < cold.iterations);
}

static void test_profile(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.85);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 731.4, 96.5, NULL, NULL, &s), HF_OK);
    size_t n = hf_line_profile(&line, &s, 10.0, NULL, 0);
    assert_true(n > 70);
    hf_line_point pts[200];
    assert_true(n <= 200);
    assert_int_equal(hf_line_profile(&line, &s, 10.0, pts, 200), n);
    assert_true(fabs(pts[0].x) < 1e-12 && fabs(pts[0].z) < 1e-12);
    assert_true(fabs(pts[n - 1].x - 731.4) < 1e-6);
    assert_true(fabs(pts[n - 1].z - 96.5) < 1e-6);
    assert_true(fabs(pts[n - 1].tension - s.tension) < 1e-6 * s.tension);
    for (size_t i = 1; i < n; i++) {
        assert_true(pts[i].arc > pts[i - 1].arc);
        assert_true(pts[i].x >= pts[i - 1].x - 1e-9);
        assert_true(pts[i].arc - pts[i - 1].arc <= 10.0 + 1e-9);
    }
    assert_int_equal(hf_line_profile(&line, &s, 0.0, pts, 200), 0);
    assert_int_equal(hf_line_profile(&line, &s, NAN, pts, 200), 0);
}

/* Options: every limit is a documented option, out-of-range values are
 * refused, and the bracketing fallback (forced by max_iter = 1) reaches the
 * same solution as Newton with no allocation: with every allocation through
 * the project allocator made to fail, the solve still succeeds (the Brent
 * solvers live on the stack; issue 11 item 5). */
static void test_options_and_fallback(void **state)
{
    (void)state;
    hf_line_options o;
    hf_line_options_default(&o);
    assert_true(o.rtol == 1e-10 && o.max_iter == 40 && o.max_backtrack == 40 &&
                o.max_bracket == 200 && o.max_shrink == 60 && o.max_polish == 20 &&
                o.max_laid == 200 && o.ftol == 1e-7 && o.max_refine == 4);
    hf_line line = three_with_clump(0.6);
    hf_line_state ref, s;
    assert_int_equal(hf_line_solve(&line, 742.35, 96.8, NULL, NULL, &ref), HF_OK);
    o.max_iter = 1;
    hf_alloc_fail_at(1, 1);
    hf_status st = hf_line_solve(&line, 742.35, 96.8, NULL, &o, &s);
    long calls = hf_alloc_count();
    hf_alloc_fail_at(0, 0);
    assert_int_equal(st, HF_OK);
    assert_int_equal(calls, 0);
    assert_true(s.evaluations > 10); /* the fallback ran */
    assert_true(RELERR(s.h, ref.h) < 1e-9 && RELERR(s.v, ref.v) < 1e-9);
    /* out-of-range options are refused, never used */
    hf_line_options bad[9];
    for (int k = 0; k < 9; k++)
        hf_line_options_default(&bad[k]);
    bad[7].ftol = 0.5;
    bad[8].max_refine = -1;
    bad[0].rtol = 0.0;
    bad[1].rtol = NAN;
    bad[2].max_iter = 0;
    bad[3].max_backtrack = 0;
    bad[4].max_bracket = -1;
    bad[5].max_shrink = 0;
    bad[6].max_laid = 0;
    for (int k = 0; k < 9; k++) {
        if (hf_line_solve(&line, 742.35, 96.8, NULL, &bad[k], &s) != HF_EINVAL)
            fail_msg("bad options %d accepted", k);
        assert_non_null(strstr(s.message, "options"));
    }
}

/* Independent reference for a single uniform section with touchdown and
 * seabed friction: the elastic catenary with a grounded part in the form of
 * Jonkman (2007), NREL/TP-500-41958, section 2 (from memory), written here
 * afresh in long double and solved by plain bisection (the suspended length
 * Ls for z, then H for x), not by the solver's Newton on (H, V):
 *   a = H / w,  z = a (sqrt(1 + (Ls/a)^2) - 1) + w Ls^2 / (2 EA),
 *   x = Lg + stretch_g + a asinh(Ls/a) + H Ls / EA,  Lg = L - Ls,
 *   stretch_g = (H Lg - mu w Lg^2 / 2) / EA, or H^2 / (2 mu w EA) once
 *   friction takes the whole tension. */
typedef struct {
    long double L, w, ea, mu;
} ref_line;

static long double ref_z(const ref_line *r, long double H, long double ls)
{
    long double a = H / r->w, q = ls / a;
    return a * (sqrtl(1.0L + q * q) - 1.0L) + r->w * ls * ls / (2.0L * r->ea);
}

static long double ref_x(const ref_line *r, long double H, long double ls)
{
    long double a = H / r->w, lg = r->L - ls, f = r->mu * r->w;
    long double sg =
        H >= f * lg ? (H * lg - 0.5L * f * lg * lg) / r->ea : H * H / (2.0L * f * r->ea);
    return lg + sg + a * asinhl(ls / a) + H * ls / r->ea;
}

static long double ref_ls(const ref_line *r, long double H, long double Z)
{
    long double lo = 0.0L, hi = r->L;
    for (int i = 0; i < 200; i++) {
        long double m = 0.5L * (lo + hi);
        if (ref_z(r, H, m) < Z)
            lo = m;
        else
            hi = m;
    }
    return 0.5L * (lo + hi);
}

static long double ref_h(const ref_line *r, long double X, long double Z)
{
    long double lo = 1e-9L, hi = 1e9L;
    for (int i = 0; i < 400; i++) {
        long double m = sqrtl(lo * hi);
        if (ref_x(r, m, ref_ls(r, m, Z)) < X)
            lo = m;
        else
            hi = m;
    }
    return sqrtl(lo * hi);
}

/* Issue 12 item 14: nearly laid lines (Z = 0.001 m, X = L - 0.0009 m).  The
 * span test alone stopped with H off by up to 7.6e-4 relative (the span is
 * almost insensitive to H there); the solver now converges on the forces as
 * well (ftol, default 1e-7 relative) and reports its estimate. */
static void test_nearly_laid(void **state)
{
    (void)state;
    const double cases[][4] = {
        /* L m, w N/m, EA N, mu */
        {850.0, 1000.0, 5e8, 0.0},
        {873.4, 1127.6, 6.12e8, 0.0},
        {412.9, 698.1, 3.84e8, 0.73},
        {1260.5, 1871.3, 9.71e8, 1.0},
    };
    for (size_t c = 0; c < sizeof cases / sizeof cases[0]; c++) {
        hf_line line = one(cases[c][0], cases[c][1], cases[c][2], cases[c][3]);
        ref_line r = {cases[c][0], cases[c][1], cases[c][2], cases[c][3]};
        const double dz[] = {0.001, 0.0137};
        for (size_t j = 0; j < 2; j++) {
            double Z = dz[j], X = cases[c][0] - 0.0009;
            hf_line_state s;
            assert_int_equal(hf_line_solve(&line, X, Z, NULL, NULL, &s), HF_OK);
            assert_int_equal(s.regime, HF_LINE_TOUCHDOWN);
            long double H = ref_h(&r, X, Z);
            long double V = r.w * ref_ls(&r, H, Z);
            double eh = (double)fabsl((s.h - H) / H), ev = (double)fabsl((s.v - V) / V);
            if (!(eh <= 1e-7 && ev <= 1e-7))
                fail_msg("line %zu Z %.4g: H %.10g (reference %.10Lg, rel %.2e), V %.10g "
                         "(reference %.10Lg, rel %.2e)",
                         c, Z, s.h, H, eh, s.v, V, ev);
            assert_true(s.force_error <= 1e-7);
        }
    }
    /* with the force test switched off, the span test alone misses H: the
     * check above is what the refinement buys */
    hf_line_options o;
    hf_line_options_default(&o);
    o.max_refine = 0;
    hf_line line = one(850.0, 1000.0, 5e8, 0.0);
    ref_line r = {850.0, 1000.0, 5e8, 0.0};
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 850.0 - 0.0009, 0.001, NULL, &o, &s), HF_OK);
    long double H = ref_h(&r, 850.0 - 0.0009, 0.001);
    assert_true(fabsl((s.h - H) / H) > 1e-6);
    assert_true(s.force_error > 1e-7); /* and the estimate says so */
}

/* Issue 12 item 15: a buoy line whose hanging (slack) column is invalid but
 * whose taut shape the solver does find, with H in the hundreds of kN, was
 * refused as "a buoy in a slack line".  The message now says what was found
 * (a sag into the seabed), and h, v carry that shape's forces, which the
 * forward map confirms reach the fairlead. */
static void test_refusal_says_what_was_found(void **state)
{
    (void)state;
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 2;
    l.sec[0] = (hf_section){103.7, 987.5, 4.9e8, 5e6, 0.5, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){546.3, 987.5, 4.9e8, 5e6, 0.5, {0.0, 0.0, 0.0}};
    l.joint[0] = (hf_joint){-693.4e3, 0.5};
    hf_line_state s;
    /* once refused (a sag into the seabed), now a hump lifting the anchor's
     * end and a landed sag: tests/test_line_contact.c checks the shape */
    assert_int_equal(hf_line_solve(&l, 431.2, 94.6, NULL, NULL, &s), HF_OK);
    double x, z, J[2][2];
    assert_int_equal(hf_line_span(&l, s.h, s.v, &x, &z, J), HF_OK);
    assert_float_equal(x, 431.2, 1e-6);
    assert_float_equal(z, 94.6, 1e-6);
    /* where no taut shape exists either, the message says both */
    l.sec[0].length = 512.9;
    l.sec[1].length = 137.1;
    assert_int_equal(hf_line_solve(&l, 431.2, 94.6, NULL, NULL, &s), HF_EUNSUPPORTED);
    if (!strstr(s.message, "no taut shape"))
        fail_msg("message \"%s\"", s.message);
    assert_true(s.h == 0.0);
}

/* Issue 12 item 6: an MBL so small that T / MBL overflows (1e-305 N: a
 * normal double, but 1e5 N / 1e-305 N is beyond DBL_MAX = 1.8e308, C11
 * 5.2.4.2.2) is refused, never reported as an infinite utilisation. */
static void test_unrepresentable_utilisation(void **state)
{
    (void)state;
    hf_line line = three_with_clump(0.6);
    line.sec[1].mbl = 1e-305;
    hf_line_state s;
    assert_int_equal(hf_line_solve(&line, 742.35, 96.8, NULL, NULL, &s), HF_EINVAL);
    assert_non_null(strstr(s.message, "utilisation"));
    no_nan(&s);
    line.sec[1].mbl = 1e-3; /* tiny but representable: solved, utilisation finite */
    assert_int_equal(hf_line_solve(&line, 742.35, 96.8, NULL, NULL, &s), HF_OK);
    assert_true(isfinite(s.max_utilisation) && s.max_utilisation > 1e6);
}

/* Issue 12 item 16: a clump and a buoy at one grounded joint (the
 * fictional "Dunmore" line: 120 kN clump with friction 0.8 under a 70 kN
 * buoy).  The rule (docs/theory.md, "Point loads on the seabed"): the seabed
 * carries the net normal force N = 120 - 70 = 50 kN under the clump, the
 * floating buoy touches nothing, so the tension drops by mu_clump N =
 * 0.8 x 50 kN = 40 kN across the joint (Coulomb friction on a block, any
 * statics text), not by 0.8 x 120 kN nor by a load-weighted mean of the two
 * coefficients times N (0.533 x 50 kN, what a weighting over clump and buoy
 * gives).  The model layer passes the joint the net load and the clumps'
 * friction; here the line is given them directly. */
static void test_clump_and_buoy_on_seabed(void **state)
{
    (void)state;
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 2;
    l.sec[0] = (hf_section){300.0, 903.7, 5.2e8, 6e6, 0.1, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){560.0, 903.7, 5.2e8, 6e6, 0.1, {0.0, 0.0, 0.0}};
    l.joint[0] = (hf_joint){120e3 - 70e3, 0.8};
    hf_line_state s;
    assert_int_equal(hf_line_solve(&l, 838.6, 71.3, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_TOUCHDOWN);
    /* the whole first section and the joint on the seabed, touchdown in section 1 */
    assert_true(s.section[0].grounded == 300.0);
    assert_true(s.section[1].grounded > 0.0 && s.section[1].grounded < 560.0);
    /* drop across the joint: mu_clump x net load */
    assert_float_equal(s.section[1].t_lower - s.section[0].t_upper, 0.8 * 50e3, 1e-6);
    /* and the anchor by hand: H, less mu w per grounded metre, less the joint */
    double hand = s.h - 0.1 * 903.7 * s.section[1].grounded - 0.8 * 50e3 - 0.1 * 903.7 * 300.0;
    assert_true(hand > 0.0);
    assert_float_equal(s.anchor_tension, hand, 1e-6 * s.h);
}

/* Deterministic generator (xorshift64*), so failures reproduce. */
static uint64_t rng = 0x9E3779B97F4A7C15ull;
static double urand(void)
{
    rng ^= rng >> 12;
    rng ^= rng << 25;
    rng ^= rng >> 27;
    return (double)((rng * 2685821657736338717ull) >> 11) * 0x1.0p-53;
}
static double lrand(double lo, double hi)
{
    return lo * pow(hi / lo, urand());
}

/* 10,000 random physically valid lines: 100 % convergence, residual within
 * 1e-9, no NaN, and the solution reproduces the span through the forward map.
 * Every miss fails at once with its own message (case, line, span, status);
 * the closing checks are on what the sample must cover. */
static void test_random(void **state)
{
    (void)state;
    int total = 10000;
    double worst = 0.0, worst_fe = 0.0;
    int regimes[5] = {0};
    long evals = 0;
    int max_evals = 0;
    for (int c = 0; c < total; c++) {
        hf_line line;
        memset(&line, 0, sizeof line);
        line.n = 1 + (size_t)(urand() * 4.0);
        double L = 0.0, W = 0.0;
        for (size_t k = 0; k < line.n; k++) {
            hf_section *s = &line.sec[k];
            s->length = lrand(5.0, 800.0);
            s->weight = lrand(20.0, 3000.0);
            s->ea = lrand(1e6, 2e10);
            s->mbl = lrand(1e5, 2e7);
            s->friction = urand() * 1.2;
            L += s->length;
            W += s->weight * s->length;
            if (k + 1 < line.n && urand() < 0.4) {
                line.joint[k].load = lrand(1e3, 2e5);
                line.joint[k].friction = urand();
                W += line.joint[k].load;
            }
        }
        double Z = urand() * 0.9 * L;
        /* a third of the spans anywhere (many slack), the rest near taut */
        double chord = sqrt(fmax(L * L - Z * Z, 0.0));
        double X = c % 3 == 0 ? urand() * 1.05 * chord : (0.8 + 0.25 * urand()) * chord;
        hf_line_state s;
        hf_status st = hf_line_solve(&line, X, Z, NULL, NULL, &s);
        if (st != HF_OK) {
            fail_msg("case %d: n=%zu X=%.17g Z=%.17g status %s: %s", c, line.n, X, Z,
                     hf_status_str(st), s.message);
        }
        if (!(s.residual <= 1e-9))
            fail_msg("case %d: n=%zu X=%.17g Z=%.17g residual %.3e above 1e-9", c, line.n, X, Z,
                     s.residual);
        no_nan(&s);
        regimes[s.regime]++;
        evals += s.evaluations;
        max_evals = s.evaluations > max_evals ? s.evaluations : max_evals;
        worst = fmax(worst, s.residual);
        worst_fe = fmax(worst_fe, s.force_error);
        if (s.regime == HF_LINE_SUSPENDED || s.regime == HF_LINE_TOUCHDOWN) {
            double x, z, J[2][2];
            assert_int_equal(hf_line_span(&line, s.h, s.v, &x, &z, J), HF_OK);
            double scale = fmax(L, hypot(X, Z));
            if (fabs(x - X) > 1e-9 * scale || fabs(z - Z) > 1e-9 * scale)
                fail_msg("case %d: forward map misses by %.3e, %.3e", c, x - X, z - Z);
        }
    }
    print_message("random lines: %d converged, largest residual %.3e, largest force error "
                  "estimate %.3e; regimes susp %d touchdown %d slack %d vertical %d laid %d; "
                  "evaluations mean %.3f max %d\n",
                  total, worst, worst_fe, regimes[0], regimes[1], regimes[2], regimes[3],
                  regimes[4], (double)evals / total, max_evals);
    if (!(worst_fe <= 1e-7)) /* the default ftol: forces converged, not only the span */
        fail_msg("largest force error estimate %.3e above 1e-7", worst_fe);
    /* the sample must exercise the three regimes random spans reach */
    if (regimes[HF_LINE_SUSPENDED] < 1000 || regimes[HF_LINE_TOUCHDOWN] < 1000 ||
        regimes[HF_LINE_SLACK] < 1000)
        fail_msg("random sample too narrow: suspended %d, touchdown %d, slack %d (want >= 1000 "
                 "each)",
                 regimes[0], regimes[1], regimes[2]);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_catenary_identities),
        cmocka_unit_test(test_catenary_touchdown),
        cmocka_unit_test(test_touchdown_hand_calculation),
        cmocka_unit_test(test_oc3_line),
        cmocka_unit_test(test_ode_single),
        cmocka_unit_test(test_ode_multi),
        cmocka_unit_test(test_touchdown_at_clump),
        cmocka_unit_test(test_friction_takes_all),
        cmocka_unit_test(test_slack),
        cmocka_unit_test(test_slack_clumps),
        cmocka_unit_test(test_vertical),
        cmocka_unit_test(test_taut_stretched),
        cmocka_unit_test(test_laid),
        cmocka_unit_test(test_buoy_unsupported),
        cmocka_unit_test(test_lazy_wave),
        cmocka_unit_test(test_bad_input),
        cmocka_unit_test(test_jacobian),
        cmocka_unit_test(test_stiffness),
        cmocka_unit_test(test_warm_start),
        cmocka_unit_test(test_profile),
        cmocka_unit_test(test_options_and_fallback),
        cmocka_unit_test(test_nearly_laid),
        cmocka_unit_test(test_refusal_says_what_was_found),
        cmocka_unit_test(test_unrepresentable_utilisation),
        cmocka_unit_test(test_clump_and_buoy_on_seabed),
        cmocka_unit_test(test_random),
    };
    return cmocka_run_group_tests_name("line", tests, NULL, NULL);
}
