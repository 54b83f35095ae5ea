/* case_env.c - the case loader's part for the quasi-static design method
 * (issue 14): the hull's design keys (hull.mass, hull.added_mass,
 * hull.yaw_inertia, hull.added_yaw_inertia, hull.damping, the four table
 * paths, hull.wind_area, hull.current_area, hull.length) and the top-level
 * `environments:` list, into the model's hf_designdata (designdata.h).
 * Called from case.c (load_hull, load_root); shares its tree and checks
 * through case_tree.h.  Table paths are relative to the case file's
 * directory; a table's own errors keep their file:line:col and follow the
 * case key's location.  Each environment is checked against the tables at
 * the hull's rest heading when loaded (hf_env_check: heading and frequency
 * coverage, spectrum limits); the design driver checks again at the mean
 * heading.  Key meanings and units: docs/design.md, docs/case-format.md. */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/designdata.h"
#include "case_tree.h"

#define GOT(n) hf_case_tree_got((n), gotbuf, sizeof gotbuf)

/* The design record of the model being loaded, allocated on first use. */
static hf_designdata *data(ctx *c)
{
    if (!c->m->design)
        c->m->design = hf_designdata_alloc();
    return c->m->design;
}

/* ---- quantities the units module does not know: time, mass moment, fraction ---- */

typedef struct {
    const char *unit;
    double factor; /* to SI */
} unit_factor;

static const unit_factor time_units[] = {{"s", 1.0}, {"min", 60.0}, {"h", 3600.0}, {NULL, 0}};
static const unit_factor inertia_units[] = {{"kg*m^2", 1.0}, {"kg m^2", 1.0}, {"kg*m2", 1.0},
                                            {"t*m^2", 1e3},  {"t m^2", 1e3},  {"t*m2", 1e3},
                                            {NULL, 0}};
static const unit_factor fraction_units[] = {{"%", 0.01}, {NULL, 0}};

/* A number with an optional unit from `units` (a plain number is SI). */
static hf_status scaled(ctx *c, const node *n, const unit_factor *units, const char *what,
                        double lo, double hi, double *out)
{
    char gotbuf[96];
    if (!n || n->type != N_SCALAR || hf_case_tree_is_null(n))
        return hf_case_tree_fail(c, n, "expected %s, got %s", what, GOT(n));
    char *end;
    double v = strtod(n->text, &end);
    while (isspace((unsigned char)*end))
        end++;
    double f = 0.0;
    if (end == n->text)
        f = 0.0;
    else if (!*end)
        f = 1.0;
    for (const unit_factor *u = units; *end && u->unit; u++)
        if (!strcmp(end, u->unit))
            f = u->factor;
    v *= f;
    if (f == 0.0 || !isfinite(v) || v < lo || v > hi) {
        char list[96];
        size_t len = 0;
        for (const unit_factor *u = units; u->unit; u++)
            len +=
                (size_t)snprintf(list + len, sizeof list - len, "%s%s", len ? ", " : "", u->unit);
        return hf_case_tree_fail(c, n, "expected %s (%s), got %s", what, list, GOT(n));
    }
    *out = v;
    return HF_OK;
}

/* Optional key with a scaled() value. */
static hf_status opt_scaled(ctx *c, const node *map, const char *key, const unit_factor *units,
                            const char *what, double lo, double hi, double *out)
{
    const node *v = hf_case_tree_get(map, key);
    if (!v)
        return HF_OK;
    size_t mark = hf_case_tree_pushkey(c, key);
    hf_status st = scaled(c, v, units, what, lo, hi, out);
    hf_case_tree_pop(c, mark);
    return st;
}

/* A list of k values under `key`, each read by one of the readers above. */
static hf_status opt_list(ctx *c, const node *map, const char *key, size_t k, const char *what,
                          hf_dim dim, const unit_factor *units, double *out)
{
    char gotbuf[96];
    const node *v = hf_case_tree_get(map, key);
    if (!v)
        return HF_OK;
    size_t mark = hf_case_tree_pushkey(c, key);
    hf_status st = HF_OK;
    if (v->type != N_SEQ || v->n != k)
        st = hf_case_tree_fail(c, v, "expected %s (a list of %zu values), got %s", what, k,
                               v->type == N_SEQ ? "a list of another length" : GOT(v));
    for (size_t i = 0; st == HF_OK && i < k; i++) {
        size_t m2 = hf_case_tree_pushindex(c, i);
        if (units)
            st = scaled(c, v->kids[i], units, "a damping ratio, a fraction of critical in (0, 1)",
                        1e-9, 1.0 - 1e-9, &out[i]);
        else
            st = hf_case_tree_quantity(c, v->kids[i], dim, HF_CASE_NONNEG, &out[i]);
        hf_case_tree_pop(c, m2);
    }
    hf_case_tree_pop(c, mark);
    return st;
}

/* ---- tables ---- */

/* Path of `rel` relative to the case file's directory (rel when absolute
 * or when the case has no directory part); caller frees. */
static char *relative_path(const char *casefile, const char *rel)
{
    const char *slash = strrchr(casefile, '/');
    if (rel[0] == '/' || !slash)
        return hf_strdup(rel);
    size_t dl = (size_t)(slash - casefile) + 1, rl = strlen(rel);
    char *p = hf_malloc(dl + rl + 1);
    if (p) {
        memcpy(p, casefile, dl);
        memcpy(p + dl, rel, rl + 1);
    }
    return p;
}

static hf_status load_table(ctx *c, const node *map, int i)
{
    const char *key = hf_designdata_table_key(i);
    const node *v = hf_case_tree_get(map, key);
    if (!v)
        return HF_OK;
    size_t mark = hf_case_tree_pushkey(c, key);
    const char *rel;
    hf_designdata *d = data(c);
    hf_status st =
        d ? hf_case_tree_text(c, v, "a table file (CSV), relative to the case file", &rel)
          : hf_case_tree_nomem(c);
    if (st == HF_OK && !(d->path[i] = relative_path(c->file, rel)))
        st = hf_case_tree_nomem(c);
    if (st == HF_OK) {
        hf_error sub;
        hf_error_clear(&sub);
        st = hf_table_load(d->path[i], hf_designdata_table_kind(i), &d->table[i], &sub);
        if (st == HF_ENOMEM)
            st = hf_case_tree_nomem(c);
        else if (st != HF_OK)
            st = hf_case_tree_fail(c, v, "expected a %s table (%s): %s",
                                   hf_table_kind_name(hf_designdata_table_kind(i)),
                                   hf_table_columns(hf_designdata_table_kind(i)), sub.text);
    }
    hf_case_tree_pop(c, mark);
    return st;
}

/* ---- hull keys ---- */

hf_status hf_case_env_hull(ctx *c, const node *n)
{
    static const char *const keys[] = {
        "mass",         "added_mass", "yaw_inertia",       "added_yaw_inertia",    "damping",
        "raos",         "drift",      "wind_coefficients", "current_coefficients", "wind_area",
        "current_area", "length"};
    int any = 0;
    for (size_t i = 0; i < sizeof keys / sizeof keys[0]; i++)
        any |= hf_case_tree_get(n, keys[i]) != NULL;
    if (!any)
        return HF_OK;
    hf_designdata *d = data(c);
    if (!d)
        return hf_case_tree_nomem(c);
    d->has_mass = hf_case_tree_get(n, "mass") != NULL;
    hf_status st;
    if ((st = hf_case_tree_opt_quantity(c, n, "mass", HF_DIM_MASS, HF_CASE_POSITIVE, &d->mass)) !=
            HF_OK ||
        (st = opt_list(c, n, "added_mass", 2, "the added masses [surge, sway]", HF_DIM_MASS, NULL,
                       d->added_mass)) != HF_OK ||
        (st = opt_scaled(c, n, "yaw_inertia", inertia_units, "a positive mass moment of inertia",
                         1e-300, INFINITY, &d->yaw_inertia)) != HF_OK ||
        (st = opt_scaled(c, n, "added_yaw_inertia", inertia_units, "a mass moment of inertia >= 0",
                         0.0, INFINITY, &d->added_yaw_inertia)) != HF_OK ||
        (st = opt_list(c, n, "damping", 3, "the damping ratios [surge, sway, yaw]", HF_DIM_NONE,
                       fraction_units, d->damping)) != HF_OK ||
        (st = hf_case_tree_opt_quantity(c, n, "wind_area", HF_DIM_AREA, HF_CASE_POSITIVE,
                                        &d->wind_area)) != HF_OK ||
        (st = hf_case_tree_opt_quantity(c, n, "current_area", HF_DIM_AREA, HF_CASE_POSITIVE,
                                        &d->current_area)) != HF_OK ||
        (st = hf_case_tree_opt_quantity(c, n, "length", HF_DIM_LENGTH, HF_CASE_POSITIVE,
                                        &d->length)) != HF_OK)
        return st;
    for (int i = 0; st == HF_OK && i < HF_DD_NTABLES; i++)
        st = load_table(c, n, i);
    return st;
}

/* ---- environments ---- */

static const char *const env_keys[] = {"name", "wind", "current", "waves", "duration", NULL};
static const char *const flow_keys[] = {"speed", "direction", NULL};
static const char *const wave_keys[] = {"hs", "tp", "gamma", "direction", NULL};

static hf_status req(ctx *c, const node *map, const char *key, hf_dim dim, int range,
                     const char *what, double *out)
{
    if (!hf_case_tree_get(map, key))
        return hf_case_tree_missing(c, map, key, what);
    return hf_case_tree_opt_quantity(c, map, key, dim, range, out);
}

static hf_status env_flow(ctx *c, const node *map, const char *key, int *has, hf_env_flow *f)
{
    const node *v = hf_case_tree_get(map, key);
    if (!v)
        return HF_OK;
    size_t mark = hf_case_tree_pushkey(c, key);
    char what[64];
    snprintf(what, sizeof what, "the %s (speed, direction toward)", key);
    hf_status st = hf_case_tree_map_check(c, v, what, flow_keys);
    if (st == HF_OK)
        st = req(c, v, "speed", HF_DIM_SPEED, HF_CASE_NONNEG, "a speed >= 0", &f->speed);
    if (st == HF_OK)
        st = req(c, v, "direction", HF_DIM_ANGLE, HF_CASE_ANY, "a direction (where it goes toward)",
                 &f->direction);
    hf_case_tree_pop(c, mark);
    *has = st == HF_OK;
    return st;
}

static hf_status env_waves(ctx *c, const node *map, hf_environment *e)
{
    const node *v = hf_case_tree_get(map, "waves");
    if (!v)
        return HF_OK;
    size_t mark = hf_case_tree_pushkey(c, "waves");
    hf_status st =
        hf_case_tree_map_check(c, v, "the waves (hs, tp, gamma, direction toward)", wave_keys);
    if (st == HF_OK)
        st = req(c, v, "hs", HF_DIM_LENGTH, HF_CASE_POSITIVE, "a positive significant wave height",
                 &e->waves.hs);
    if (st == HF_OK && !hf_case_tree_get(v, "tp"))
        st = hf_case_tree_missing(c, v, "tp", "a positive peak period");
    if (st == HF_OK)
        st = opt_scaled(c, v, "tp", time_units, "a positive peak period", 1e-300, INFINITY,
                        &e->waves.tp);
    if (st == HF_OK)
        st = opt_scaled(c, v, "gamma", fraction_units + 1, "a peak factor gamma from 1 to 10", 1.0,
                        HF_SPECTRUM_GAMMA_MAX, &e->waves.gamma);
    if (st == HF_OK)
        st = req(c, v, "direction", HF_DIM_ANGLE, HF_CASE_ANY,
                 "a direction (where the waves go toward)", &e->waves.direction);
    hf_case_tree_pop(c, mark);
    e->has_waves = st == HF_OK;
    return st;
}

/* Parses environment i into d->env[i] (name, parts, duration). */
static hf_status load_env(ctx *c, const node *n, hf_designdata *d, size_t i)
{
    char gotbuf[96];
    hf_designdata_env *de = &d->env[i];
    hf_environment_default(&de->env);
    de->src_line = n ? n->line : 0, de->src_col = n ? n->col : 0;
    hf_status st = hf_case_tree_map_check(c, n,
                                          "an environment (name, wind, current, waves, "
                                          "duration)",
                                          env_keys);
    if (st != HF_OK)
        return st;
    const node *nn = hf_case_tree_get(n, "name");
    if (!nn)
        return hf_case_tree_missing(c, n, "name", "a name for the environment");
    size_t mark = hf_case_tree_pushkey(c, "name");
    st = hf_case_tree_name_dup(c, nn, "an environment name", &de->name);
    for (size_t j = 0; st == HF_OK && j < i; j++)
        if (!strcmp(d->env[j].name, de->name))
            st = hf_case_tree_fail(c, nn, "expected each environment name once, got %s again",
                                   GOT(nn));
    hf_case_tree_pop(c, mark);
    de->env.name = de->name;
    if (st == HF_OK)
        st = env_flow(c, n, "wind", &de->env.has_wind, &de->env.wind);
    if (st == HF_OK)
        st = env_flow(c, n, "current", &de->env.has_current, &de->env.current);
    if (st == HF_OK)
        st = env_waves(c, n, &de->env);
    if (st == HF_OK)
        st = opt_scaled(c, n, "duration", time_units, "a positive storm duration", 1e-300, INFINITY,
                        &de->env.duration);
    return st;
}

/* Checks environment i against the hull's tables at the rest heading. */
static hf_status check_env(ctx *c, const node *n, const hf_designdata *d, size_t i,
                           hf_env_workspace *ws)
{
    hf_env_hull h;
    hf_designdata_hull(d, c->m->site.water_density, &h);
    hf_error sub;
    hf_error_clear(&sub);
    hf_status st = hf_env_check(&h, &d->env[i].env, c->m->hull.heading, ws, NULL, &sub);
    if (st == HF_EINVAL)
        return hf_case_tree_fail(c, n, "%s", sub.text);
    if (st != HF_OK)
        return hf_error_set(c->err, st, "%s:%d:%d: %s", c->file, n->line, n->col, sub.text);
    return HF_OK;
}

hf_status hf_case_env_list(ctx *c, const node *n)
{
    char gotbuf[96];
    if (hf_case_tree_is_null(n))
        return HF_OK;
    if (n->type != N_SEQ)
        return hf_case_tree_fail(c, n, "expected a list of environments, got %s", GOT(n));
    if (n->n > HF_DESIGNDATA_MAX_ENV) {
        hf_case_tree_fail(c, n, "expected at most %d environments (HF_DESIGNDATA_MAX_ENV), got %zu",
                          HF_DESIGNDATA_MAX_ENV, n->n);
        return hf_error_set(c->err, HF_ELIMIT, "%s", c->err->text);
    }
    hf_designdata *d = data(c);
    if (!d || (n->n && !(d->env = hf_calloc(n->n, sizeof *d->env))))
        return hf_case_tree_nomem(c);
    hf_error sub;
    hf_env_workspace *ws = hf_env_workspace_alloc(&sub);
    if (!ws)
        return hf_case_tree_nomem(c);
    hf_status st = HF_OK;
    for (size_t i = 0; st == HF_OK && i < n->n; i++) {
        size_t mark = hf_case_tree_pushindex(c, i);
        d->nenv = i + 1;
        st = load_env(c, n->kids[i], d, i);
        if (st == HF_OK)
            st = check_env(c, n->kids[i], d, i, ws);
        hf_case_tree_pop(c, mark);
    }
    hf_env_workspace_free(ws);
    return st;
}

/* ---- the design study ---- */

hf_status hf_case_env_study(ctx *c, const node *n, hf_study *s)
{
    char gotbuf[96];
    const hf_designdata *d = c->m->design;
    if (!d || d->nenv == 0)
        return hf_case_tree_fail(c, n,
                                 "expected an environments: list in the case for a design study, "
                                 "got none");
    const node *v = hf_case_tree_get(n, "environments");
    if (!v)
        return HF_OK;
    size_t mark = hf_case_tree_pushkey(c, "environments");
    hf_status st = HF_OK;
    if (v->type != N_SEQ || v->n == 0)
        st = hf_case_tree_fail(c, v, "expected a list of environment names, got %s",
                               v->type == N_SEQ ? "an empty list" : GOT(v));
    else if (!(s->environments = hf_calloc(v->n, sizeof *s->environments)))
        st = hf_case_tree_nomem(c);
    for (size_t i = 0; st == HF_OK && i < v->n; i++) {
        size_t m2 = hf_case_tree_pushindex(c, i);
        st = hf_case_tree_name_dup(c, v->kids[i], "an environment name", &s->environments[i]);
        if (st == HF_OK) {
            s->nenvironments = i + 1;
            if (hf_designdata_env_find(d, s->environments[i]) == (size_t)-1)
                st = hf_case_tree_fail(c, v->kids[i],
                                       "expected the name of an environment of "
                                       "the case, got %s",
                                       GOT(v->kids[i]));
        }
        hf_case_tree_pop(c, m2);
    }
    hf_case_tree_pop(c, mark);
    return st;
}
