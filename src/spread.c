/* spread.c - hull pose, per-line solves, force/moment sums and the analytic 6x6 stiffness. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/spread.h"

struct hf_spread {
    const hf_model *m; /* borrowed */
    size_t n;          /* number of lines */
    hf_line_options opt;
    hf_line_state *states; /* last state of each line */
    unsigned char *warm;   /* 1 = states[i] is a good warm start */
    unsigned char *broken; /* 1 = line excluded */
    hf_spread_geom *geom;  /* geometry at the last pose */
    double (*force)[3];    /* force on the hull at each fairlead, N */
    double *tension;       /* largest tension along each line, N */
    hf_line_state scratch; /* the solve's output before it replaces states[i] */
    hf_line sloped;        /* a line with the seabed slope of its plane (sloped seabed only) */
};

#define NONE ((size_t)-1)

void hf_spread_pose_rest(const hf_model *m, hf_pose *pose)
{
    memset(pose, 0, sizeof *pose);
    pose->surge = m->hull.position[0];
    pose->sway = m->hull.position[1];
    pose->yaw = m->hull.heading;
}

void hf_spread_pose_offset(hf_pose *pose, const double offset[3])
{
    pose->surge += offset[0];
    pose->sway += offset[1];
    pose->yaw += offset[2];
}

void hf_spread_pose_rotation(const hf_pose *pose, double rot[3][3])
{
    /* R = Rz(yaw) Ry(pitch) Rx(roll), written out. */
    double cf = cos(pose->roll), sf = sin(pose->roll);
    double ct = cos(pose->pitch), st = sin(pose->pitch);
    double cp = cos(pose->yaw), sp = sin(pose->yaw);
    rot[0][0] = cp * ct;
    rot[0][1] = cp * st * sf - sp * cf;
    rot[0][2] = cp * st * cf + sp * sf;
    rot[1][0] = sp * ct;
    rot[1][1] = sp * st * sf + cp * cf;
    rot[1][2] = sp * st * cf - cp * sf;
    rot[2][0] = -st;
    rot[2][1] = ct * sf;
    rot[2][2] = ct * cf;
}

hf_status hf_spread_pose_check(const hf_pose *pose, hf_error *err)
{
    const double v[6] = {pose->surge, pose->sway, pose->heave, pose->roll, pose->pitch, pose->yaw};
    static const char *const names[6] = {"surge", "sway", "heave", "roll", "pitch", "yaw"};
    for (int i = 0; i < 6; i++)
        if (!isfinite(v[i]))
            return hf_error_set(err, HF_EINVAL, "hull pose: %s is not a finite number", names[i]);
    return HF_OK;
}

/* Geometry from a precomputed rotation. */
static void geometry(const hf_model *m, size_t i, const hf_pose *pose, double rot[3][3],
                     hf_spread_geom *g)
{
    const double *p = m->lines[i].fairlead;
    const double ref[3] = {pose->surge, pose->sway, pose->heave};
    for (int a = 0; a < 3; a++) {
        g->arm[a] = rot[a][0] * p[0] + rot[a][1] * p[1] + rot[a][2] * p[2];
        g->fairlead[a] = ref[a] + g->arm[a];
    }
    double dx = g->fairlead[0] - m->lines[i].anchor[0];
    double dy = g->fairlead[1] - m->lines[i].anchor[1];
    g->x = hypot(dx, dy);
    g->z = g->fairlead[2] + hf_model_water_height(m);
    if (g->x > 0.0) {
        g->dir[0] = dx / g->x;
        g->dir[1] = dy / g->x;
    } else {
        g->dir[0] = 1.0;
        g->dir[1] = 0.0;
    }
    g->slope = g->anchor_rise = 0.0;
    if (m->site.seabed_slope != 0.0) { /* sloped seabed: the anchor's own depth */
        g->anchor_rise = hf_model_seabed_rise(m, m->lines[i].anchor[0], m->lines[i].anchor[1]);
        g->z -= g->anchor_rise;
        g->slope = hf_model_seabed_slope_along(m, g->dir);
    }
}

hf_status hf_spread_line_geometry(const hf_model *m, size_t i, const hf_pose *pose,
                                  hf_spread_geom *g, hf_error *err)
{
    if (i >= m->nlines)
        return hf_error_set(err, HF_EINVAL, "line index %zu out of range (%zu lines)", i,
                            m->nlines);
    hf_status s = hf_spread_pose_check(pose, err);
    if (s != HF_OK)
        return s;
    double rot[3][3];
    hf_spread_pose_rotation(pose, rot);
    geometry(m, i, pose, rot, g);
    return HF_OK;
}

hf_spread *hf_spread_alloc(const hf_model *m, hf_error *err)
{
    hf_spread *ws = hf_calloc(1, sizeof *ws);
    if (!ws) {
        hf_error_set(err, HF_ENOMEM, "out of memory allocating the spread workspace");
        return NULL;
    }
    ws->m = m;
    ws->n = m->nlines;
    hf_line_options_default(&ws->opt);
    size_t k = ws->n ? ws->n : 1; /* calloc(0) may return NULL */
    ws->states = hf_calloc(k, sizeof *ws->states);
    ws->warm = hf_calloc(k, sizeof *ws->warm);
    ws->broken = hf_calloc(k, sizeof *ws->broken);
    ws->geom = hf_calloc(k, sizeof *ws->geom);
    ws->force = hf_calloc(k, sizeof *ws->force);
    ws->tension = hf_calloc(k, sizeof *ws->tension);
    if (!ws->states || !ws->warm || !ws->broken || !ws->geom || !ws->force || !ws->tension) {
        hf_spread_free(ws);
        hf_error_set(err, HF_ENOMEM, "out of memory allocating the spread workspace (%zu lines)",
                     m->nlines);
        return NULL;
    }
    return ws;
}

void hf_spread_free(hf_spread *ws)
{
    if (!ws)
        return;
    hf_free(ws->states);
    hf_free(ws->warm);
    hf_free(ws->broken);
    hf_free(ws->geom);
    hf_free(ws->force);
    hf_free(ws->tension);
    hf_free(ws);
}

const hf_model *hf_spread_model(const hf_spread *ws)
{
    return ws->m;
}

size_t hf_spread_nlines(const hf_spread *ws)
{
    return ws->n;
}

void hf_spread_set_options(hf_spread *ws, const hf_line_options *opt)
{
    if (opt)
        ws->opt = *opt;
    else
        hf_line_options_default(&ws->opt);
}

void hf_spread_reset(hf_spread *ws)
{
    memset(ws->warm, 0, ws->n);
}

hf_status hf_spread_set_broken(hf_spread *ws, size_t i, int broken)
{
    if (i >= ws->n)
        return HF_EINVAL;
    ws->broken[i] = broken ? 1 : 0;
    return HF_OK;
}

void hf_spread_clear_broken(hf_spread *ws)
{
    memset(ws->broken, 0, ws->n);
}

int hf_spread_is_broken(const hf_spread *ws, size_t i)
{
    return i < ws->n && ws->broken[i];
}

/* Name of line i for messages. */
static const char *line_name(const hf_model *m, size_t i, char buf[32])
{
    if (m->lines[i].name)
        return m->lines[i].name;
    snprintf(buf, 32, "#%zu", i);
    return buf;
}

/* Largest tension along a solved line, N. */
static double line_tmax(const hf_line_state *s)
{
    double t = fmax(s->tension, s->anchor_tension);
    for (size_t k = 0; k < s->n && k < HF_LINE_MAX_SECTIONS; k++)
        t = fmax(t, s->section[k].t_max);
    return t;
}

static void result_fill(hf_spread *ws, hf_spread_result *res)
{
    res->nlines = ws->n;
    res->states = ws->states;
    res->geom = ws->geom;
    res->line_force = (const double(*)[3])ws->force;
    res->line_tension = ws->tension;
    res->broken = ws->broken;
}

/* Solves line i at geometry g into ws->states[i]; warm start when available,
 * cold retry on failure. */
static hf_status solve_line(hf_spread *ws, size_t i)
{
    const hf_line *line = &ws->m->lines[i].line;
    const hf_spread_geom *g = &ws->geom[i];
    if (g->slope != 0.0) { /* the model's line with its plane's seabed slope */
        ws->sloped = *line;
        ws->sloped.slope = g->slope;
        line = &ws->sloped;
    }
    hf_line_state *st = &ws->states[i];
    hf_line_state *out = &ws->scratch; /* the solver fills every field it reports */
    hf_status s = HF_EINVAL;
    if (ws->warm[i]) {
        s = hf_line_solve(line, g->x, g->z, st, &ws->opt, out);
        if (s != HF_OK)
            s = hf_line_solve(line, g->x, g->z, NULL, &ws->opt, out);
    } else {
        s = hf_line_solve(line, g->x, g->z, NULL, &ws->opt, out);
    }
    hf_line_state_copy(st, out);
    st->status = s;
    ws->warm[i] = s == HF_OK;
    return s;
}

/* Marks line i unsolved with status s and a static reason. */
static void line_unsolved(hf_spread *ws, size_t i, hf_status s, const char *why)
{
    hf_line_state *st = &ws->states[i];
    memset(st, 0, sizeof *st);
    st->status = s;
    st->message = why;
    st->n = ws->m->lines[i].line.n;
    ws->warm[i] = 0;
}

/* A line on a sloped seabed that the line solver refused: when the line
 * check names the reason (a solver without slope support refuses the slope
 * itself), returns 1 with that status in *s and, when `report`, its message
 * and the slope in err; 0 otherwise (nothing changed). */
static int sloped_refusal(hf_spread *ws, size_t i, int report, hf_error *err, hf_status *s)
{
    hf_error why;
    hf_error_clear(&why);
    hf_status cs = hf_line_check(&ws->sloped, &why);
    if (cs == HF_OK)
        return 0;
    char buf[32];
    ws->states[i].status = *s = cs;
    ws->states[i].message = "the line solver does not take this line on a sloped seabed";
    if (report)
        hf_error_set(err, cs, "line '%s': %s (seabed slope %.4g deg along the line's plane)",
                     line_name(ws->m, i, buf), why.text, ws->geom[i].slope * 180.0 / M_PI);
    return 1;
}

/* Solves line i at its geometry (ws->geom[i]) with the checks the line
 * solver cannot make, since it knows nothing of the water: the fairlead must
 * be between the seabed and the still water level, and no point of the
 * solved line above the water (a buoy can lift a line out of it; the model
 * uses wet weights and does not cover a line in air: issue 12 item 2).
 * Returns HF_OK or the status, with the message in err when `report`. */
static hf_status line_at_pose(hf_spread *ws, size_t i, int report, hf_error *err)
{
    const hf_model *m = ws->m;
    const hf_spread_geom *g = &ws->geom[i];
    /* still water level above the seabed at the anchor, m */
    double water = hf_model_water_height(m) - g->anchor_rise;
    double below = g->x * tan(g->slope) - g->z; /* fairlead below the seabed under it, m */
    char buf[32];
    if (!(below <= 0.0)) {
        line_unsolved(ws, i, HF_EINVAL, "fairlead below the seabed at this pose");
        return report ? hf_error_set(err, HF_EINVAL,
                                     "line '%s': the fairlead is %.6g m below the seabed at this "
                                     "hull pose",
                                     line_name(m, i, buf), below)
                      : HF_EINVAL;
    }
    if (g->fairlead[2] > 0.0) {
        line_unsolved(ws, i, HF_EUNSUPPORTED, "fairlead above the still water level at this pose");
        return report ? hf_error_set(err, HF_EUNSUPPORTED,
                                     "line '%s': the fairlead is %.6g m above the still water "
                                     "level at this hull pose; a line in air is not modelled "
                                     "(its weight would be taken as the wet weight)",
                                     line_name(m, i, buf), g->fairlead[2])
                      : HF_EUNSUPPORTED;
    }
    hf_status s = solve_line(ws, i);
    const hf_line_state *st = &ws->states[i];
    if (s != HF_OK && g->slope != 0.0 && sloped_refusal(ws, i, report, err, &s))
        return s;
    if (s != HF_OK && st->h > 0.0) /* a shape was found and refused: say which */
        return report ? hf_error_set(err, s,
                                     "line '%s': %s (horizontal span %.6g m, height %.6g m; "
                                     "shape found: H %.4g kN, V %.4g kN at the fairlead)",
                                     line_name(m, i, buf), st->message, g->x, g->z, st->h / 1e3,
                                     st->v / 1e3)
                      : s;
    if (s != HF_OK)
        return report
                   ? hf_error_set(err, s, "line '%s': %s (horizontal span %.6g m, height %.6g m)",
                                  line_name(m, i, buf),
                                  st->message && st->message[0] ? st->message : hf_status_str(s),
                                  g->x, g->z)
                   : s;
    if (st->z_max > water + 1e-9 * fmax(water, 1.0)) {
        double top = st->z_max, above = top - water; /* read before the state is cleared */
        line_unsolved(ws, i, HF_EUNSUPPORTED, "a buoy lifts the line above the still water level");
        return report ? hf_error_set(err, HF_EUNSUPPORTED,
                                     "line '%s': its buoys would lift the line %.4g m above the "
                                     "still water level (highest point %.6g m above the seabed, "
                                     "water %.6g m deep); a line out of the water is not modelled",
                                     line_name(m, i, buf), above, top, water)
                      : HF_EUNSUPPORTED;
    }
    return HF_OK;
}

hf_status hf_spread_solve(hf_spread *ws, const hf_pose *pose, hf_spread_result *res, hf_error *err)
{
    const hf_model *m = ws->m;
    memset(res, 0, sizeof *res);
    res->failed_line = res->max_tension_line = res->max_utilisation_line = NONE;
    result_fill(ws, res);
    hf_status s = hf_spread_pose_check(pose, err);
    if (s == HF_OK && m->nlines != ws->n)
        s = hf_error_set(err, HF_EINVAL,
                         "spread workspace sized for %zu lines used with a model of %zu lines",
                         ws->n, m->nlines);
    if (s != HF_OK) {
        res->status = s;
        return s;
    }
    double rot[3][3];
    hf_spread_pose_rotation(pose, rot);
    hf_status first = HF_OK;
    for (size_t i = 0; i < ws->n; i++) {
        hf_spread_geom *g = &ws->geom[i];
        geometry(m, i, pose, rot, g);
        hf_line_state *st = &ws->states[i];
        ws->force[i][0] = ws->force[i][1] = ws->force[i][2] = 0.0;
        ws->tension[i] = 0.0;
        if (ws->broken[i]) {
            memset(st, 0, sizeof *st);
            st->status = HF_OK;
            st->message = "broken";
            st->n = m->lines[i].line.n;
            continue;
        }
        s = line_at_pose(ws, i, first == HF_OK, err);
        if (s != HF_OK) {
            if (first == HF_OK) {
                first = s;
                res->failed_line = i;
            }
            continue;
        }
        /* The line pulls the hull toward its anchor with h and down with v. */
        ws->force[i][0] = -st->h * g->dir[0];
        ws->force[i][1] = -st->h * g->dir[1];
        ws->force[i][2] = -st->v;
        ws->tension[i] = line_tmax(st);
    }
    res->status = first;
    if (first != HF_OK)
        return first;
    for (size_t i = 0; i < ws->n; i++) {
        if (ws->broken[i])
            continue;
        const double *f = ws->force[i];
        const double *r = ws->geom[i].arm;
        res->force[0] += f[0];
        res->force[1] += f[1];
        res->force[2] += f[2];
        res->force[3] += r[1] * f[2] - r[2] * f[1];
        res->force[4] += r[2] * f[0] - r[0] * f[2];
        res->force[5] += r[0] * f[1] - r[1] * f[0];
        if (res->max_tension_line == NONE || ws->tension[i] > res->max_tension) {
            res->max_tension = ws->tension[i];
            res->max_tension_line = i;
        }
        double u = ws->states[i].max_utilisation;
        if (res->max_utilisation_line == NONE || u > res->max_utilisation) {
            res->max_utilisation = u;
            res->max_utilisation_line = i;
        }
    }
    return HF_OK;
}

static void cross(const double a[3], const double b[3], double c[3])
{
    c[0] = a[1] * b[2] - a[2] * b[1];
    c[1] = a[2] * b[0] - a[0] * b[2];
    c[2] = a[0] * b[1] - a[1] * b[0];
}

hf_status hf_spread_stiffness(hf_spread *ws, const hf_pose *pose, double K[6][6],
                              hf_spread_result *res, hf_error *err)
{
    memset(K, 0, 36 * sizeof K[0][0]);
    hf_status s = hf_spread_solve(ws, pose, res, err);
    if (s != HF_OK)
        return s;
    /* Rotation axes of the Euler angles (docs/spread.md): with R = Rz Ry Rx,
     * dR/droll = [Rz Ry ex]x R, dR/dpitch = [Rz ey]x R, dR/dyaw = [ez]x R. */
    double ct = cos(pose->pitch), st = sin(pose->pitch);
    double cp = cos(pose->yaw), sp = sin(pose->yaw);
    const double axis[3][3] = {{cp * ct, sp * ct, -st}, {-sp, cp, 0.0}, {0.0, 0.0, 1.0}};
    for (size_t i = 0; i < ws->n; i++) {
        if (ws->broken[i])
            continue;
        const hf_line_state *ls = &ws->states[i];
        const hf_spread_geom *g = &ws->geom[i];
        const double *u = g->dir, *f = ws->force[i], *r = g->arm;
        double kxx = ls->stiffness[0][0], kxz = ls->stiffness[0][1];
        double kzx = ls->stiffness[1][0], kzz = ls->stiffness[1][1];
        /* Transverse stiffness h/X: sideways fairlead motion turns the line's
         * plane; at X = 0 every horizontal direction is radial. */
        double kt = g->x > 0.0 ? ls->h / g->x : kxx;
        /* G = d(force on hull)/d(fairlead position), force = (-h u, -v). */
        double G[3][3];
        for (int a = 0; a < 2; a++) {
            for (int b = 0; b < 2; b++)
                G[a][b] = -(kxx * u[a] * u[b] + kt * ((a == b) - u[a] * u[b]));
            G[a][2] = -kxz * u[a];
            G[2][a] = -kzx * u[a];
        }
        G[2][2] = -kzz;
        /* Translations q_k (k < 3): the fairlead moves by e_k, the arm not:
         * dF = G e_k, dM = r x dF. */
        for (int k = 0; k < 3; k++) {
            double df[3] = {G[0][k], G[1][k], G[2][k]}, m2[3];
            cross(r, df, m2);
            for (int a = 0; a < 3; a++) {
                K[a][k] -= df[a];
                K[3 + a][k] -= m2[a];
            }
        }
        /* Rotations: fairlead and arm move by J = axis x r;
         * dF = G J, dM = J x f + r x dF. */
        for (int j = 0; j < 3; j++) {
            double J[3], df[3], m1[3], m2[3];
            cross(axis[j], r, J);
            for (int a = 0; a < 3; a++)
                df[a] = G[a][0] * J[0] + G[a][1] * J[1] + G[a][2] * J[2];
            cross(J, f, m1);
            cross(r, df, m2);
            for (int a = 0; a < 3; a++) {
                K[a][3 + j] -= df[a];
                K[3 + a][3 + j] -= m1[a] + m2[a];
            }
        }
    }
    return HF_OK;
}
