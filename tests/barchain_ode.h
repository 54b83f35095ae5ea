/* barchain_ode.h - the elastic catenary's equilibrium ODEs integrated with
 * GSL odeiv2, a reference for line shapes with any tension-strain law (tests
 * only).  Header-only (static functions): a test program that includes it
 * links GSL itself, so the support objects linked into every test program
 * (the tests directory's files other than test_*.c, some programs linked
 * without GSL) do not need it.
 * Outside the library flow. */
#ifndef HOLDFAST_TEST_BARCHAIN_ODE_H
#define HOLDFAST_TEST_BARCHAIN_ODE_H

#include <math.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include "holdfast/line.h"
#include "holdfast/status.h"

/* Strain of section s at tension T >= 0: T / EA, or the polynomial
 * hf_section.strain in t = T / MBL extended along its tangent past t = 1
 * (as the bar chain, tests/barchain.c). */
static double ode_strain(const hf_section *s, double tension)
{
    const double *a = s->strain;
    if (a[0] == 0.0 && a[1] == 0.0 && a[2] == 0.0)
        return tension / s->ea;
    double t = tension / s->mbl;
    if (t > 1.0)
        return a[0] + a[1] + a[2] + (a[0] + 2 * a[1] + 3 * a[2]) * (t - 1.0);
    return t * (a[0] + t * (a[1] + t * a[2]));
}

typedef struct {
    const hf_section *s;
    double h, vb; /* H, and V at the section's lower end */
} ode_par;

static int ode_rhs(double t, const double y[], double f[], void *params)
{
    const ode_par *p = params;
    double v = p->vb + p->s->weight * t, tt = hypot(p->h, v);
    double e = ode_strain(p->s, tt);
    (void)y;
    f[0] = (1.0 + e) * p->h / tt;
    f[1] = (1.0 + e) * v / tt;
    return GSL_SUCCESS;
}

/* Fairlead position (x, z) relative to the anchor of a fully suspended line
 * carrying fairlead forces h > 0 (horizontal) and v (vertical, down): the
 * elastic catenary's equilibrium ODEs integrated along the unstretched arc,
 *     dx/ds = (1 + e(T)) H / T,   dz/ds = (1 + e(T)) V(s) / T,   dV/ds = w,
 * T = sqrt(H^2 + V^2), section by section from the anchor, V dropping by the
 * joint loads, e(T) each section's strain law (T/EA, or hf_section.strain,
 * extended linearly past T = MBL as in the bar chain).  GSL odeiv2 (rk8pd,
 * relative and absolute tolerance 1e-13 of the line length).  A reference
 * for any strain law, independent of closed forms.  No seabed: the caller
 * picks forces that keep the line above it (V at the anchor > 0 on a flat
 * seabed).  HF_OK, HF_EINVAL (h <= 0, bad line) or HF_ENOCONV. */
static hf_status barchain_ode_span(const hf_line *line, double h, double v, double *x, double *z)
{
    if (!line || line->n < 1 || line->n > HF_LINE_MAX_SECTIONS || !(h > 0) || !isfinite(h) ||
        !isfinite(v))
        return HF_EINVAL;
    double ltot = hf_line_length(line), vb = v - hf_line_weight(line); /* V at the anchor */
    double y[2] = {0.0, 0.0};
    for (size_t i = 0; i < line->n; i++) {
        ode_par p = {&line->sec[i], h, vb};
        gsl_odeiv2_system sys = {ode_rhs, NULL, 2, &p};
        gsl_odeiv2_driver *d = gsl_odeiv2_driver_alloc_y_new(
            &sys, gsl_odeiv2_step_rk8pd, 1e-3 * line->sec[i].length, 1e-13 * ltot, 1e-13);
        if (!d)
            return HF_ENOMEM;
        double t = 0.0;
        int rc = gsl_odeiv2_driver_apply(d, &t, line->sec[i].length, y);
        gsl_odeiv2_driver_free(d);
        if (rc != GSL_SUCCESS)
            return HF_ENOCONV;
        vb += line->sec[i].weight * line->sec[i].length;
        if (i + 1 < line->n)
            vb += line->joint[i].load;
    }
    *x = y[0];
    *z = y[1];
    return HF_OK;
}

#endif
