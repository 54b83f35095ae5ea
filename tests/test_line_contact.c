/* test_line_contact.c - the line solver's shapes with several seabed
 * contacts (issue 15): humps lifted by buoys off the grounded line, a hump
 * that lifts the anchor's end, sags landing between buoys, a hump on a
 * stretch friction has slackened (a vertical loop).  Outside references:
 * the classical catenary identities of each arc (Irvine, Cable Structures,
 * 1981, ch. 1: H constant along an arc, T = w z + const, s = a tan(theta)),
 * an independent integration of the cable's equilibrium ODEs (GSL odeiv2)
 * from the fairlead down through every landing and lift-off, and central
 * differences for the analytic Jacobian. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include "support.h"
#include "holdfast/line.h"

#define RELERR(a, b) (fabs((a) - (b)) / fmax(fabs(b), 1e-300))

/* --- independent model: the cable's equilibrium ODEs -------------------- */

typedef struct {
    double w, ea;
} ode_par;

/* State (x, z, V, H) against unstretched arc s measured DOWN the line:
 * dx/ds = -(H/T)(1 + T/EA), dz/ds = -(V/T)(1 + T/EA), dV/ds = -w
 * (equilibrium of an element, Irvine 1981, eq. 2.1-2.3).  H = 0 (a hump on a
 * slackened stretch) hangs straight: dx/ds = 0. */
static int cable_rhs(double s, const double y[], double f[], void *p)
{
    (void)s;
    const ode_par *q = p;
    double H = y[3], V = y[2];
    double T = hypot(H, V);
    double ch = T > 0.0 ? H / T : 0.0, cv = T > 0.0 ? V / T : 0.0;
    f[0] = -ch * (1.0 + T / q->ea);
    f[1] = -cv * (1.0 + T / q->ea);
    f[2] = -q->w;
    f[3] = 0.0;
    return GSL_SUCCESS;
}

/* Grounded: state (x, T); dx/ds = -(1 + T/EA), dT/ds = -mu w while T > 0
 * (axial Coulomb friction, tension falling toward the anchor). */
static int ground_rhs(double s, const double y[], double f[], void *p)
{
    (void)s;
    const double *q = p; /* mu w, EA */
    double T = fmax(y[1], 0.0);
    f[0] = -(1.0 + T / q[1]);
    f[1] = -q[0];
    return GSL_SUCCESS;
}

static void integrate(gsl_odeiv2_system *sys, double *y, double len)
{
    if (!(len > 0.0))
        return;
    gsl_odeiv2_driver *d =
        gsl_odeiv2_driver_alloc_y_new(sys, gsl_odeiv2_step_rk8pd, len * 1e-3, 1e-13, 1e-13);
    double s = 0.0;
    int rc = gsl_odeiv2_driver_apply(d, &s, len, y);
    gsl_odeiv2_driver_free(d);
    if (rc != GSL_SUCCESS)
        fail_msg("ODE integration failed (%d) at s = %g of %g", rc, s, len);
}

typedef struct {
    double x, z, V, H, T;
    int grounded;
    int landings, liftoffs;
    double scale, eps;
} ode_walk;

/* Suspended piece of length len in section sec. */
static void ode_susp(ode_walk *o, const hf_section *sec, double len)
{
    ode_par p = {sec->weight, sec->ea};
    gsl_odeiv2_system sys = {cable_rhs, NULL, 4, &p};
    double y[4] = {o->x, o->z, o->V, o->H};
    integrate(&sys, y, len);
    o->x = y[0];
    o->z = y[1];
    o->V = o->V - sec->weight * len; /* exact: dV/ds = -w */
}

/* Grounded piece of length len: the tension falls by mu w per metre toward
 * the anchor, never below zero (integrated up to T = 0, then unstretched). */
static void ode_ground(ode_walk *o, const hf_section *sec, double len)
{
    double q[2] = {sec->friction * sec->weight, sec->ea};
    gsl_odeiv2_system sys = {ground_rhs, NULL, 2, q};
    double y[2] = {o->x, o->T};
    double l1 = q[0] > 0.0 ? fmin(len, o->T / q[0]) : len;
    integrate(&sys, y, l1);
    o->x = y[0] - (len - l1);
    o->T = l1 < len ? 0.0 : fmax(y[1], 0.0);
    if (fabs(o->z) > o->eps)
        fail_msg("a grounded stretch at height %.3e m", o->z);
}

/* One section walked down: suspended pieces ending where V reaches 0 on
 * the seabed (a landing), grounded pieces as long as the solver says
 * (section result `grounded`), lifting off with V = 0 and H = T where the
 * section goes on below them (the upper half of a hump).  The ODEs decide
 * where each arc lands and at what height, so a wrong lift-off shows as a
 * landing off the seabed or a walk that misses the anchor. */
static void ode_section(ode_walk *o, const hf_section *sec, double gl)
{
    double left = sec->length;
    while (left > 1e-12 * sec->length) {
        if (!o->grounded) {
            if (o->V > 0.0 && o->V - sec->weight * left < 0.0) {
                double l0 = o->V / sec->weight;
                ode_susp(o, sec, l0);
                o->V = 0.0;
                left -= l0;
                if (fabs(o->z) < o->eps && gl > 0.0) {
                    o->grounded = 1;
                    o->T = o->H;
                    o->landings++;
                } else if (!(o->z > -o->eps)) {
                    fail_msg("a sag %.3e m below the seabed", o->z);
                }
                continue;
            }
            ode_susp(o, sec, left);
            left = 0.0;
        } else {
            double g = fmin(left, gl);
            ode_ground(o, sec, g);
            left -= g;
            gl -= g;
            if (left > 1e-12 * sec->length) {
                o->grounded = 0; /* lift-off: V = 0, the arc's H is the tension here */
                o->H = o->T;
                o->V = 0.0;
                o->liftoffs++;
            }
        }
    }
}

/* The joint above section k-1 crossed going down. */
static void ode_joint(ode_walk *o, const hf_joint *j)
{
    double P = j->load;
    if (!o->grounded) {
        if (o->V > 0.0 && o->V - P <= 0.0 && fabs(o->z) < o->eps) {
            o->grounded = 1; /* a clump resting on the seabed, carrying P - V */
            o->T = fmax(o->H - j->friction * (P - o->V), 0.0);
            o->landings++;
        } else {
            o->V -= P;
        }
    } else if (P > 0.0) {
        o->T = fmax(o->T - j->friction * P, 0.0);
    } else if (P < 0.0) {
        fail_msg("a buoy resting on the seabed");
    }
}

/* Walks the solved line from the fairlead to the anchor with the solver's
 * H, V and grounded lengths; fails unless it ends at the anchor (within
 * 1e-6 of the line's scale) with the solver's anchor forces.  Returns the
 * number of landings (seabed contacts reached from above). */
static int verify_by_ode(const hf_line *line, const hf_line_state *st)
{
    double L = hf_line_length(line);
    ode_walk o = {st->x, st->z, st->v, st->h, 0.0, 0, 0, 0, 0.0, 0.0};
    o.scale = fmax(L, hypot(st->x, st->z));
    o.eps = 1e-6 * o.scale;
    for (size_t k = line->n; k-- > 0;) {
        ode_section(&o, &line->sec[k], st->section[k].grounded);
        if (k > 0)
            ode_joint(&o, &line->joint[k - 1]);
    }
    if (fabs(o.x) > o.eps || fabs(o.z) > o.eps)
        fail_msg("ODE walk ends %.3e, %.3e m from the anchor", o.x, o.z);
    if (o.grounded) {
        HF_TEST_ASSERT_NEAR(o.T, st->anchor_tension, 1e-6 * st->tension + 1e-6);
    } else {
        HF_TEST_ASSERT_NEAR(o.V, st->anchor_v, 1e-6 * st->tension);
        HF_TEST_ASSERT_NEAR(o.H, st->anchor_h, 1e-6 * st->tension);
    }
    if (o.liftoffs > o.landings)
        fail_msg("%d lift-offs for %d landings", o.liftoffs, o.landings);
    return o.landings;
}

/* Central differences of the forward map against its analytic Jacobian,
 * at (h, v) of a solved multi-contact line. */
static void check_jacobian(const hf_line *line, double h, double v)
{
    double x, z, J[2][2];
    assert_int_equal(hf_line_span(line, h, v, &x, &z, J), HF_OK);
    double dh = 1e-6 * h, dv = 1e-6 * fmax(fabs(v), h);
    double xp, zp, xm, zm, Jd[2][2];
    assert_int_equal(hf_line_span(line, h + dh, v, &xp, &zp, Jd), HF_OK);
    assert_int_equal(hf_line_span(line, h - dh, v, &xm, &zm, Jd), HF_OK);
    double fd[2][2];
    fd[0][0] = (xp - xm) / (2.0 * dh);
    fd[1][0] = (zp - zm) / (2.0 * dh);
    assert_int_equal(hf_line_span(line, h, v + dv, &xp, &zp, Jd), HF_OK);
    assert_int_equal(hf_line_span(line, h, v - dv, &xm, &zm, Jd), HF_OK);
    fd[0][1] = (xp - xm) / (2.0 * dv);
    fd[1][1] = (zp - zm) / (2.0 * dv);
    double norm = fmax(fmax(fabs(J[0][0]), fabs(J[0][1])), fmax(fabs(J[1][0]), fabs(J[1][1])));
    for (int i = 0; i < 2; i++)
        for (int j = 0; j < 2; j++)
            if (fabs(fd[i][j] - J[i][j]) > 1e-5 * norm)
                fail_msg("J[%d][%d] analytic %.9e, central difference %.9e", i, j, J[i][j],
                         fd[i][j]);
}

static hf_line two_with_buoy(double l0, double l1, double w, double ea, double mu, double P)
{
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 2;
    l.sec[0] = (hf_section){l0, w, ea, 8e6, mu, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){l1, w, ea, 8e6, mu, {0.0, 0.0, 0.0}};
    l.joint[0] = (hf_joint){-P, 0.5};
    return l;
}

/* A frictionless, inextensible uniform line with one buoy on its grounded
 * part: the hump is a symmetric pair of catenary arcs (the buoy lifts P/2 of
 * line on each side, V1 = V2 = P/2), with the fairlead's H (no friction).
 * Classical catenary, a = H/w (Irvine 1981, ch. 1): each half spans
 * a asinh(V/H) horizontally and rises a (cosh - 1) = (sqrt(H^2 + V^2) - H)/w;
 * the tension at the buoy is w times the height above the directrix,
 * T = sqrt(H^2 + V^2); the arc from the vertex is s = a tan(theta) = V/w. */
static void test_hump_catenary_identities(void **state)
{
    (void)state;
    const double w = 853.7, P = 61.35e3;
    hf_line l = two_with_buoy(412.3, 395.9, w, 1e22, 0.0, P);
    hf_line_state s;
    assert_int_equal(hf_line_solve(&l, 757.4, 61.8, NULL, NULL, &s), HF_OK);
    assert_int_equal(s.regime, HF_LINE_TOUCHDOWN);
    double H = s.h, a = H / w, half = P / (2.0 * w);
    /* s = a tan(theta) = V/w on each side of the buoy */
    HF_TEST_ASSERT_NEAR(s.section[0].grounded, 412.3 - half, 1e-9 * 412.3);
    /* H constant: the hump carries the fairlead's H (no friction) */
    HF_TEST_ASSERT_NEAR(s.anchor_tension, H, 1e-9 * H);
    HF_TEST_ASSERT_NEAR(s.section[0].t_upper, sqrt(H * H + 0.25 * P * P), 1e-9 * H);
    HF_TEST_ASSERT_NEAR(s.section[1].t_lower, sqrt(H * H + 0.25 * P * P), 1e-9 * H);
    /* the profile at the lift-off, the buoy and the landing */
    hf_line_point pts[4096];
    size_t np = hf_line_profile(&l, &s, 0.5, pts, 4096);
    assert_true(np > 10 && np <= 4096);
    /* the lift-offs from the grounded samples next to them (inextensible:
     * x advances with the arc on the seabed) */
    double xb = NAN, zb = NAN, x0 = NAN, x1 = NAN;
    for (size_t i = 0; i < np; i++) {
        if (fabs(pts[i].arc - 412.3) < 1e-9)
            xb = pts[i].x, zb = pts[i].z;
        if (pts[i].arc <= 412.3 - half)
            x0 = pts[i].x + (412.3 - half - pts[i].arc);
        if (pts[i].arc >= 412.3 + half && isnan(x1) && pts[i].z == 0.0)
            x1 = pts[i].x - (pts[i].arc - 412.3 - half);
    }
    assert_true(isfinite(xb) && isfinite(zb));
    /* T = w z + const: the rise is (T_buoy - H) / w, a (cosh - 1) */
    HF_TEST_ASSERT_NEAR(zb, (sqrt(H * H + 0.25 * P * P) - H) / w, 1e-9 * a);
    assert_true(isfinite(x0) && isfinite(x1)); /* both lift-offs are profile points */
    HF_TEST_ASSERT_NEAR(xb - x0, a * asinh(0.5 * P / H), 1e-9 * a);
    HF_TEST_ASSERT_NEAR(x1 - xb, a * asinh(0.5 * P / H), 1e-9 * a);
    assert_int_equal(verify_by_ode(&l, &s), 2);
}

/* Humps with friction on every grounded stretch, a clump on the seabed
 * between two buoys, different sections on either side of each buoy (the
 * fictional "Carrow Bank" line: chain, wire, chain, wire). */
static void test_humps_with_friction(void **state)
{
    (void)state;
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 4;
    l.sec[0] = (hf_section){187.3, 1062.0, 5.1e8, 6e6, 0.93, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){263.9, 213.7, 2.9e8, 4e6, 0.41, {0.0, 0.0, 0.0}};
    l.sec[2] = (hf_section){152.6, 1062.0, 5.1e8, 6e6, 0.93, {0.0, 0.0, 0.0}};
    l.sec[3] = (hf_section){318.4, 213.7, 2.9e8, 4e6, 0.41, {0.0, 0.0, 0.0}};
    l.joint[0] = (hf_joint){-37.9e3, 0.5};
    l.joint[1] = (hf_joint){52.4e3, 0.77};
    l.joint[2] = (hf_joint){-44.1e3, 0.5};
    double Xs[] = {838.5, 852.0, 866.25, 878.0};
    for (size_t i = 0; i < 4; i++) {
        hf_line_state s;
        hf_status st = hf_line_solve(&l, Xs[i], 57.3, NULL, NULL, &s);
        if (st != HF_OK)
            fail_msg("X = %g: %s", Xs[i], s.message);
        assert_true(s.residual <= 1e-9);
        int landings = verify_by_ode(&l, &s);
        if (landings < 2)
            fail_msg("X = %g: %d seabed contacts, expected humps", Xs[i], landings);
        check_jacobian(&l, s.h, s.v);
        /* the stiffness is the inverse of that flexibility: a small move
         * of the fairlead predicts the new forces to first order */
        hf_line_state s2;
        assert_int_equal(hf_line_solve(&l, Xs[i] + 0.01, 57.3, NULL, NULL, &s2), HF_OK);
        HF_TEST_ASSERT_NEAR(s2.h - s.h, s.stiffness[0][0] * 0.01, 2e-3 * fabs(s2.h - s.h) + 1e-6);
    }
}

/* A sag between a buoy and the fairlead that lands on the seabed (two
 * touchdowns), and a buoy so strong that its hump lifts the anchor's end
 * (the line leaves the anchor with uplift).  Both used to be refused. */
static void test_landing_sag_and_lifted_anchor(void **state)
{
    (void)state;
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 3;
    l.sec[0] = (hf_section){300.0, 1100.0, 5e8, 6e6, 1.0, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){200.0, 300.0, 3e8, 5e6, 0.6, {0.0, 0.0, 0.0}};
    l.sec[2] = (hf_section){250.0, 300.0, 3e8, 5e6, 0.6, {0.0, 0.0, 0.0}};
    l.joint[1] = (hf_joint){-103.7e3, 0.5};
    hf_line_state s;
    int landed = 0;
    for (double X = 372.5; X < 452.0; X += 20.75) {
        hf_status st = hf_line_solve(&l, X, 41.3, NULL, NULL, &s);
        if (st != HF_OK)
            fail_msg("X = %g: %s", X, s.message);
        if (verify_by_ode(&l, &s) >= 2)
            landed++;
    }
    if (landed < 3)
        fail_msg("%d sags landed over the range, expected 3 (X = 372.5 to 434.75)", landed);
    /* the lifted anchor (the old test_refusal_says_what_was_found line) */
    hf_line a = two_with_buoy(103.7, 546.3, 987.5, 4.9e8, 0.5, 693.4e3);
    assert_int_equal(hf_line_solve(&a, 431.2, 94.6, NULL, NULL, &s), HF_OK);
    assert_true(s.anchor_v > 0.0 && s.anchor_angle > 0.0);
    assert_true(s.section[0].grounded == 0.0 && s.section[1].grounded > 0.0);
    verify_by_ode(&a, &s);
    check_jacobian(&a, s.h, s.v);
    /* the buoy is the highest point, above the fairlead */
    assert_true(s.z_max > 94.6);
}

/* Friction can take all the tension before a buoy (a long grounded wire
 * with mu w = 99 N/m): the buoy then stands on a vertical loop, H = 0 under
 * it, no horizontal extent.  Used to be refused. */
static void test_hump_on_slack_stretch(void **state)
{
    (void)state;
    hf_line l;
    memset(&l, 0, sizeof l);
    l.n = 3;
    l.sec[0] = (hf_section){312.5, 1136.0, 5.46e8, 6.1e6, 1.0, {0.0, 0.0, 0.0}};
    l.sec[1] = (hf_section){438.2, 165.3, 3.71e8, 5.3e6, 0.6, {0.0, 0.0, 0.0}};
    l.sec[2] = (hf_section){41.7, 1136.0, 5.46e8, 6.1e6, 1.0, {0.0, 0.0, 0.0}};
    l.joint[0] = (hf_joint){-60e3, 0.5};
    double Xs[] = {640.0, 700.0, 740.0};
    for (size_t i = 0; i < 3; i++) {
        hf_line_state s;
        hf_status st = hf_line_solve(&l, Xs[i], 96.5, NULL, NULL, &s);
        if (st != HF_OK)
            fail_msg("X = %g: %s", Xs[i], s.message);
        verify_by_ode(&l, &s);
        assert_true(s.anchor_tension == 0.0);
    }
}

int main(void)
{
    gsl_set_error_handler_off();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_hump_catenary_identities),
        cmocka_unit_test(test_humps_with_friction),
        cmocka_unit_test(test_landing_sag_and_lifted_anchor),
        cmocka_unit_test(test_hump_on_slack_stretch),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
