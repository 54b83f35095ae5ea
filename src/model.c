/* model.c - the parsed case in SI units: ownership, copy, resolve, parameter paths. */
#include <ctype.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/designdata.h"
#include "holdfast/model.h"

#define NONE ((size_t)-1)

void hf_model_init(hf_model *m)
{
    if (!m)
        return;
    memset(m, 0, sizeof *m);
    m->site.water_density = 1025.0; /* sea water, Tupper, Introduction to Naval Architecture */
    m->criteria.analysis = HF_ANALYSIS_QUASI_STATIC;
}

void hf_model_free(hf_model *m)
{
    if (!m)
        return;
    hf_free(m->title);
    hf_free(m->source_path);
    for (size_t i = 0; i < m->ncomponents; i++)
        hf_free(m->components[i].name);
    hf_free(m->components);
    for (size_t i = 0; i < m->nlines; i++) {
        hf_free(m->lines[i].name);
        hf_free(m->lines[i].pieces);
    }
    hf_free(m->lines);
    hf_free(m->hull.outline);
    for (size_t i = 0; i < m->nloads; i++) {
        hf_free(m->loads[i].name);
        hf_free(m->loads[i].drag);
    }
    hf_free(m->loads);
    hf_free(m->criteria.preset);
    hf_designdata_release(m->design);
    hf_model_init(m);
}

/* Copy helpers: each returns 0 on allocation failure.  A NULL source gives NULL. */
static int dupstr(char **dst, const char *src)
{
    *dst = NULL;
    if (!src)
        return 1;
    *dst = hf_strdup(src);
    return *dst != NULL;
}

static int dupmem(void *dst, const void *src, size_t n, size_t size)
{
    void **d = dst;
    *d = NULL;
    if (!src || n == 0)
        return 1;
    *d = hf_malloc(n * size);
    if (!*d)
        return 0;
    memcpy(*d, src, n * size);
    return 1;
}

static int copy_all(hf_model *d, const hf_model *s)
{
    if (!dupstr(&d->title, s->title) || !dupstr(&d->source_path, s->source_path))
        return 0;
    d->site = s->site;
    d->hull = s->hull;
    d->hull.outline = NULL;
    d->hull.noutline = 0;
    if (!dupmem(&d->hull.outline, s->hull.outline, s->hull.noutline, sizeof *s->hull.outline))
        return 0;
    d->hull.noutline = s->hull.noutline;
    d->criteria = s->criteria;
    d->criteria.preset = NULL;
    if (!dupstr(&d->criteria.preset, s->criteria.preset))
        return 0;
    d->design = hf_designdata_retain(s->design); /* immutable: shared */

    if (s->ncomponents) {
        d->components = hf_calloc(s->ncomponents, sizeof *d->components);
        if (!d->components)
            return 0;
        d->ncomponents = s->ncomponents;
        for (size_t i = 0; i < s->ncomponents; i++) {
            d->components[i] = s->components[i];
            if (!dupstr(&d->components[i].name, s->components[i].name))
                return 0;
        }
    }
    if (s->nlines) {
        d->lines = hf_calloc(s->nlines, sizeof *d->lines);
        if (!d->lines)
            return 0;
        d->nlines = s->nlines;
        for (size_t i = 0; i < s->nlines; i++) {
            d->lines[i] = s->lines[i];
            d->lines[i].name = NULL;
            d->lines[i].pieces = NULL;
            if (!dupstr(&d->lines[i].name, s->lines[i].name) ||
                !dupmem(&d->lines[i].pieces, s->lines[i].pieces, s->lines[i].npieces,
                        sizeof(hf_piece)))
                return 0;
        }
    }
    if (s->nloads) {
        d->loads = hf_calloc(s->nloads, sizeof *d->loads);
        if (!d->loads)
            return 0;
        d->nloads = s->nloads;
        for (size_t i = 0; i < s->nloads; i++) {
            d->loads[i] = s->loads[i];
            d->loads[i].name = NULL;
            d->loads[i].drag = NULL;
            if (!dupstr(&d->loads[i].name, s->loads[i].name) ||
                !dupmem(&d->loads[i].drag, s->loads[i].drag, s->loads[i].ndrag, sizeof(hf_drag)))
                return 0;
        }
    }
    return 1;
}

hf_status hf_model_copy(hf_model *dst, const hf_model *src)
{
    hf_model_init(dst);
    if (!src)
        return HF_OK;
    if (!copy_all(dst, src)) {
        hf_model_free(dst);
        return HF_ENOMEM;
    }
    return HF_OK;
}

double hf_model_water_height(const hf_model *m)
{
    return m->site.depth + m->site.water_level;
}

size_t hf_model_line_find(const hf_model *m, const char *name)
{
    for (size_t i = 0; name && i < m->nlines; i++)
        if (m->lines[i].name && !strcmp(m->lines[i].name, name))
            return i;
    return NONE;
}

size_t hf_model_component_find(const hf_model *m, const char *name)
{
    for (size_t i = 0; name && i < m->ncomponents; i++)
        if (m->components[i].name && !strcmp(m->components[i].name, name))
            return i;
    return NONE;
}

size_t hf_model_load_find(const hf_model *m, const char *name)
{
    for (size_t i = 0; name && i < m->nloads; i++)
        if (m->loads[i].name && !strcmp(m->loads[i].name, name))
            return i;
    return NONE;
}

/* Builds line l's hf_line from its pieces and the resolved components. */
static hf_status build_line(const hf_model *m, hf_model_line *l, hf_error *err)
{
    hf_line *ln = &l->line;
    memset(ln, 0, sizeof *ln);
    double load = 0.0, fload = 0.0; /* pending point load at the next joint, N; sum mu|P|, N */
    int pending = 0;
    size_t pending_at = 0;
    for (size_t k = 0; k < l->npieces; k++) {
        const hf_piece *p = &l->pieces[k];
        if (p->kind != HF_PIECE_SECTION) {
            if (ln->n == 0)
                return hf_error_set(err, HF_EINVAL,
                                    "lines[%s].sections[%zu]: a clump or buoy must sit between two "
                                    "component sections, not at the anchor end",
                                    l->name, k);
            if (!(isfinite(p->load) && p->load > 0.0) ||
                !(isfinite(p->friction) && p->friction >= 0.0))
                return hf_error_set(err, HF_EINVAL,
                                    "lines[%s].sections[%zu]: expected a positive %s force and a "
                                    "friction >= 0, got %.10g N and %.10g",
                                    l->name, k, p->kind == HF_PIECE_CLUMP ? "clump" : "buoy",
                                    p->load, p->friction);
            double signed_load = p->kind == HF_PIECE_CLUMP ? p->load : -p->load;
            load += signed_load;
            if (p->kind == HF_PIECE_CLUMP) /* only clumps touch the seabed */
                fload += p->friction * p->load;
            if (!pending)
                pending_at = k;
            pending = 1;
            continue;
        }
        if (ln->n >= HF_LINE_MAX_SECTIONS)
            return hf_error_set(err, HF_ELIMIT,
                                "lines[%s].sections[%zu]: more than %d component sections in one "
                                "line (limit HF_LINE_MAX_SECTIONS)",
                                l->name, k, HF_LINE_MAX_SECTIONS);
        if (p->component >= m->ncomponents)
            return hf_error_set(err, HF_EINVAL, "lines[%s].sections[%zu]: no such component",
                                l->name, k);
        if (!(isfinite(p->length) && p->length > 0.0))
            return hf_error_set(err, HF_EINVAL,
                                "lines[%s].sections[%zu].length: expected a positive length, got "
                                "%.10g m",
                                l->name, k, p->length);
        if (pending) {
            /* Consecutive point loads add (clumps down, buoys up).  Only the
             * clumps touch the seabed, so the joint's friction coefficient is
             * weighted over the clumps alone: mu_c = sum(mu_i P_i) / sum(P_i),
             * applied by the line solver to the net normal force (a 120 kN
             * clump, mu 0.8, under a 70 kN buoy: 0.8 x 50 kN = 40 kN; see
             * docs/theory.md, "Point loads on the seabed"). */
            hf_joint *j = &ln->joint[ln->n - 1];
            j->load = load;
            double total = 0.0;
            for (size_t q = pending_at; q < k; q++)
                if (l->pieces[q].kind == HF_PIECE_CLUMP)
                    total += l->pieces[q].load;
            j->friction = total > 0.0 ? fload / total : 0.0;
            load = fload = 0.0;
            pending = 0;
        }
        const hf_component *c = &m->components[p->component].comp;
        hf_section *s = &ln->sec[ln->n++];
        s->length = p->length;
        s->weight = c->value[HF_PROP_WET_WEIGHT];
        s->ea = c->value[HF_PROP_EA];
        s->mbl = c->value[HF_PROP_MBL];
        s->friction = c->value[HF_PROP_FRICTION];
    }
    if (pending)
        return hf_error_set(err, HF_EINVAL,
                            "lines[%s].sections[%zu]: a clump or buoy must sit between two "
                            "component sections, not at the fairlead end",
                            l->name, pending_at);
    if (ln->n == 0)
        return hf_error_set(err, HF_EINVAL,
                            "lines[%s].sections: expected at least one component "
                            "section, got none",
                            l->name);
    hf_error sub;
    hf_error_clear(&sub);
    if (hf_line_check(ln, &sub) != HF_OK)
        return hf_error_set(err, HF_EINVAL, "lines[%s]: %s", l->name, sub.text);
    return HF_OK;
}

/* Site and geometry checks that do not need the components. */
static hf_status check_geometry(const hf_model *m, hf_error *err)
{
    const hf_site *s = &m->site;
    if (!(isfinite(s->depth) && s->depth > 0.0))
        return hf_error_set(err, HF_EINVAL, "site.depth: expected a positive length, got %.10g m",
                            s->depth);
    if (!isfinite(s->water_level) || !(s->depth + s->water_level > 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "site.water_level: expected a finite length above -depth (%.10g m), "
                            "got %.10g m",
                            -s->depth, s->water_level);
    if (!(isfinite(s->water_density) && s->water_density > 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "site.water_density: expected a positive density, got %.10g kg/m^3",
                            s->water_density);
    if (!isfinite(m->hull.heading) || !isfinite(m->hull.position[0]) ||
        !isfinite(m->hull.position[1]))
        return hf_error_set(err, HF_EINVAL, "hull: expected a finite position and heading");
    double seabed = -hf_model_water_height(m);
    for (size_t i = 0; i < m->nlines; i++) {
        const hf_model_line *l = &m->lines[i];
        for (int k = 0; k < 3; k++)
            if (!isfinite(l->fairlead[k]) || (k < 2 && !isfinite(l->anchor[k])))
                return hf_error_set(err, HF_EINVAL,
                                    "lines[%s]: expected finite anchor and fairlead coordinates",
                                    l->name);
        if (l->fairlead[2] < seabed)
            return hf_error_set(err, HF_EINVAL,
                                "lines[%s].fairlead: expected a fairlead above the seabed (z >= "
                                "%.10g m in the hull frame), got z = %.10g m",
                                l->name, seabed, l->fairlead[2]);
    }
    for (size_t i = 0; i < m->nloads; i++) {
        const hf_load *ld = &m->loads[i];
        if (!(isfinite(ld->force) && ld->force >= 0.0) || !isfinite(ld->direction) ||
            !isfinite(ld->moment))
            return hf_error_set(err, HF_EINVAL,
                                "loads[%s]: expected a finite force >= 0, direction and moment, "
                                "got force %.10g N",
                                ld->name, ld->force);
    }
    return HF_OK;
}

hf_status hf_model_resolve(hf_model *m, hf_error *err)
{
    hf_status st = check_geometry(m, err);
    if (st != HF_OK)
        return st;
    for (size_t i = 0; i < m->ncomponents; i++) {
        hf_model_component *c = &m->components[i];
        hf_error sub;
        hf_error_clear(&sub);
        st = hf_component_resolve(&c->comp, m->site.water_density, &sub);
        if (st != HF_OK)
            return hf_error_set(err, st, "components.%s: %s", c->name, sub.text);
    }
    for (size_t i = 0; i < m->nlines; i++) {
        st = build_line(m, &m->lines[i], err);
        if (st != HF_OK)
            return st;
    }
    return HF_OK;
}

/* ---- parameter paths ---- */

enum {
    P_SITE_DEPTH = 1,
    P_SITE_LEVEL,
    P_SITE_DENSITY,
    P_COMP_DIAMETER,
    P_COMP_PROP, /* index = component, sub = hf_component_prop */
    P_PIECE_LENGTH,
    P_PIECE_LOAD, /* index = line, sub = piece */
    P_ANCHOR_RADIUS,
    P_ANCHOR_X,
    P_ANCHOR_Y, /* index = line */
    P_FAIRLEAD, /* index = line, sub = 0, 1, 2 */
    P_LOAD_FORCE,
    P_LOAD_DIRECTION,
    P_LOAD_MOMENT, /* index = load */
    P_HULL_HEADING,
    P_HULL_X,
    P_HULL_Y
};

static const char path_forms[] =
    "site.depth, site.water_level, site.water_density, components.NAME.{diameter, mass, "
    "wet_weight, axial_stiffness, breaking_load, seabed_friction}, "
    "lines[NAME|INDEX].sections[K].{length, clump, buoy}, lines[..].anchor_radius, "
    "lines[..].anchor.{x, y}, lines[..].fairlead.{x, y, z}, loads[NAME].{force, direction, "
    "moment}, hull.heading, hull.position.{x, y}";

static hf_status bad_path(const char *path, const char *why, hf_error *err)
{
    return hf_error_set(err, HF_EINVAL, "parameter path \"%s\": %s; expected one of %s", path, why,
                        path_forms);
}

/* Reads "NAME]" or ".NAME" / "[NAME]" selector text at *s into buf.  `bracket`
 * tells whether the selector was opened with '['.  Returns 0 when malformed. */
static int selector(const char **s, char *buf, size_t cap)
{
    const char *p = *s;
    size_t n = 0;
    if (*p == '[') {
        p++;
        while (*p && *p != ']') {
            if (n + 1 >= cap)
                return 0;
            buf[n++] = *p++;
        }
        if (*p != ']')
            return 0;
        p++;
    } else if (*p == '.') {
        p++;
        while (*p && *p != '.' && *p != '[') {
            if (n + 1 >= cap)
                return 0;
            buf[n++] = *p++;
        }
    } else {
        return 0;
    }
    buf[n] = '\0';
    *s = p;
    return n > 0;
}

/* Parses a non-negative decimal index; 0 when `t` is not one. */
static int index_of(const char *t, size_t *out)
{
    if (!*t)
        return 0;
    size_t v = 0;
    for (const char *p = t; *p; p++) {
        if (!isdigit((unsigned char)*p) || v > SIZE_MAX / 10 - 10)
            return 0;
        v = v * 10 + (size_t)(*p - '0');
    }
    *out = v;
    return 1;
}

static hf_status lookup_line(hf_model *m, const char *path, const char *rest, size_t li,
                             hf_param *p, hf_error *err)
{
    hf_model_line *l = &m->lines[li];
    p->index = li;
    if (!strcmp(rest, ".anchor_radius")) {
        p->kind = P_ANCHOR_RADIUS;
        p->dim = HF_DIM_LENGTH;
        return HF_OK;
    }
    if (!strcmp(rest, ".anchor.x") || !strcmp(rest, ".anchor.y")) {
        int k = rest[8] == 'y';
        p->kind = k ? P_ANCHOR_Y : P_ANCHOR_X;
        p->value = &l->anchor[k];
        p->dim = HF_DIM_LENGTH;
        return HF_OK;
    }
    if (!strncmp(rest, ".fairlead.", 10) && rest[10] >= 'x' && rest[10] <= 'z' && !rest[11]) {
        p->kind = P_FAIRLEAD;
        p->sub = (size_t)(rest[10] - 'x');
        p->value = &l->fairlead[p->sub];
        p->dim = HF_DIM_LENGTH;
        return HF_OK;
    }
    if (!strncmp(rest, ".sections", 9)) {
        const char *q = rest + 9;
        char buf[32];
        size_t k;
        if (*q != '[' || !selector(&q, buf, sizeof buf) || !index_of(buf, &k))
            return bad_path(path, "expected sections[K] with a 0-based index K", err);
        if (k >= l->npieces)
            return hf_error_set(err, HF_EINVAL,
                                "parameter path \"%s\": line %s has %zu sections entries "
                                "(0..%zu), got index %zu",
                                path, l->name, l->npieces, l->npieces - 1, k);
        hf_piece *pc = &l->pieces[k];
        p->sub = k;
        const char *want = pc->kind == HF_PIECE_SECTION ? ".length"
                           : pc->kind == HF_PIECE_CLUMP ? ".clump"
                                                        : ".buoy";
        if (strcmp(q, want))
            return hf_error_set(err, HF_EINVAL,
                                "parameter path \"%s\": sections[%zu] of line %s is a %s; "
                                "expected \"%s\", got \"%s\"",
                                path, k, l->name,
                                pc->kind == HF_PIECE_SECTION ? "component section"
                                : pc->kind == HF_PIECE_CLUMP ? "clump"
                                                             : "buoy",
                                want + 1, *q == '.' ? q + 1 : q);
        if (pc->kind == HF_PIECE_SECTION) {
            p->kind = P_PIECE_LENGTH;
            p->value = &pc->length;
            p->dim = HF_DIM_LENGTH;
        } else {
            p->kind = P_PIECE_LOAD;
            p->value = &pc->load;
            p->dim = HF_DIM_FORCE;
        }
        return HF_OK;
    }
    return bad_path(path, "unknown line parameter", err);
}

/* site.depth, site.water_level, site.water_density */
static hf_status lookup_site(hf_model *m, const char *path, hf_param *p, hf_error *err)
{
    const char *k = path + 5;
    p->dim = HF_DIM_LENGTH;
    if (!strcmp(k, "depth")) {
        p->kind = P_SITE_DEPTH;
        p->value = &m->site.depth;
    } else if (!strcmp(k, "water_level")) {
        p->kind = P_SITE_LEVEL;
        p->value = &m->site.water_level;
    } else if (!strcmp(k, "water_density")) {
        p->kind = P_SITE_DENSITY;
        p->value = &m->site.water_density;
        p->dim = HF_DIM_DENSITY;
    } else {
        return bad_path(path, "unknown site parameter", err);
    }
    return HF_OK;
}

/* hull.heading, hull.position.x, hull.position.y */
static hf_status lookup_hull(hf_model *m, const char *path, hf_param *p, hf_error *err)
{
    if (!strcmp(path, "hull.heading")) {
        p->kind = P_HULL_HEADING;
        p->value = &m->hull.heading;
        p->dim = HF_DIM_ANGLE;
        return HF_OK;
    }
    if (!strcmp(path, "hull.position.x") || !strcmp(path, "hull.position.y")) {
        int k = path[14] == 'y';
        p->kind = k ? P_HULL_Y : P_HULL_X;
        p->value = &m->hull.position[k];
        p->dim = HF_DIM_LENGTH;
        return HF_OK;
    }
    return bad_path(path, "unknown parameter", err);
}

/* components.NAME.PROPERTY (or components[NAME].PROPERTY) */
static hf_status lookup_component(hf_model *m, const char *path, hf_param *p, hf_error *err)
{
    char name[HF_MODEL_MAX_NAME + 2];
    const char *q = path + 10;
    if (!selector(&q, name, sizeof name))
        return bad_path(path, "expected components.NAME.PROPERTY", err);
    size_t ci = hf_model_component_find(m, name);
    if (ci == NONE)
        return hf_error_set(err, HF_EINVAL, "parameter path \"%s\": no component named \"%s\"",
                            path, name);
    p->index = ci;
    hf_component *c = &m->components[ci].comp;
    if (!strcmp(q, ".diameter")) {
        p->kind = P_COMP_DIAMETER;
        p->value = &c->diameter;
        p->dim = HF_DIM_LENGTH;
        return HF_OK;
    }
    static const struct {
        const char *key;
        hf_component_prop prop;
        hf_dim dim;
    } props[] = {
        {".mass", HF_PROP_MASS, HF_DIM_MASS_PER_LENGTH},
        {".wet_weight", HF_PROP_WET_WEIGHT, HF_DIM_FORCE_PER_LENGTH},
        {".axial_stiffness", HF_PROP_EA, HF_DIM_FORCE},
        {".breaking_load", HF_PROP_MBL, HF_DIM_FORCE},
        {".seabed_friction", HF_PROP_FRICTION, HF_DIM_NONE},
    };
    for (size_t i = 0; i < sizeof props / sizeof props[0]; i++)
        if (!strcmp(q, props[i].key)) {
            p->kind = P_COMP_PROP;
            p->sub = props[i].prop;
            p->value = &c->value[props[i].prop];
            p->dim = props[i].dim;
            return HF_OK;
        }
    return bad_path(path, "unknown component property", err);
}

/* lines[NAME|INDEX]... : the line, then lookup_line for the rest */
static hf_status lookup_lines(hf_model *m, const char *path, hf_param *p, hf_error *err)
{
    char name[HF_MODEL_MAX_NAME + 2];
    const char *q = path + 5;
    if (*q != '[' || !selector(&q, name, sizeof name))
        return bad_path(path, "expected lines[NAME] or lines[INDEX]", err);
    size_t li = hf_model_line_find(m, name);
    if (li == NONE && index_of(name, &li) && li >= m->nlines)
        return hf_error_set(err, HF_EINVAL,
                            "parameter path \"%s\": the case has %zu lines, got index %zu", path,
                            m->nlines, li);
    if (li == NONE)
        return hf_error_set(err, HF_EINVAL, "parameter path \"%s\": no line named \"%s\"", path,
                            name);
    return lookup_line(m, path, q, li, p, err);
}

/* loads[NAME|INDEX].{force, direction, moment} */
static hf_status lookup_load(hf_model *m, const char *path, hf_param *p, hf_error *err)
{
    char name[HF_MODEL_MAX_NAME + 2];
    const char *q = path + 5;
    if (!selector(&q, name, sizeof name))
        return bad_path(path, "expected loads[NAME]", err);
    size_t li = hf_model_load_find(m, name);
    if (li == NONE && index_of(name, &li) && li >= m->nloads)
        li = NONE;
    if (li == NONE)
        return hf_error_set(err, HF_EINVAL, "parameter path \"%s\": no load named \"%s\"", path,
                            name);
    p->index = li;
    hf_load *ld = &m->loads[li];
    if (!strcmp(q, ".force")) {
        if (ld->no_force)
            return hf_error_set(err, HF_EINVAL,
                                "parameter path \"%s\": the load case %s has no direct force (it "
                                "is made of its wind and current terms); give it one in the case "
                                "file (force: 0 kN, direction: ...) to vary it",
                                path, ld->name);
        p->kind = P_LOAD_FORCE;
        p->value = &ld->force;
        p->dim = HF_DIM_FORCE;
    } else if (!strcmp(q, ".direction")) {
        p->kind = P_LOAD_DIRECTION; /* derived: turns the whole load (load_turn) */
        p->dim = HF_DIM_ANGLE;
    } else if (!strcmp(q, ".moment")) {
        p->kind = P_LOAD_MOMENT;
        p->value = &ld->moment;
        p->dim = HF_DIM_MOMENT;
    } else {
        return bad_path(path, "unknown load parameter", err);
    }
    return HF_OK;
}

hf_status hf_model_param_lookup(hf_model *m, const char *path, hf_param *p, hf_error *err)
{
    memset(p, 0, sizeof *p);
    if (!m || !path)
        return bad_path(path ? path : "", "no model or path", err);
    if (!strncmp(path, "site.", 5))
        return lookup_site(m, path, p, err);
    if (!strncmp(path, "hull.", 5))
        return lookup_hull(m, path, p, err);
    if (!strncmp(path, "components", 10))
        return lookup_component(m, path, p, err);
    if (!strncmp(path, "lines", 5))
        return lookup_lines(m, path, p, err);
    if (!strncmp(path, "loads", 5))
        return lookup_load(m, path, p, err);
    return bad_path(path, "unknown parameter", err);
}

static double anchor_radius(const hf_model *m, const hf_model_line *l)
{
    return hypot(l->anchor[0] - m->hull.position[0], l->anchor[1] - m->hull.position[1]);
}

/* The direction of a whole load case: its direct force's, else its first
 * drag term's (0 for a load of a moment only), rad. */
static double load_direction(const hf_load *ld)
{
    if (!ld->no_force || ld->ndrag == 0)
        return ld->direction;
    return ld->drag[0].direction;
}

/* Turns every part of load ld so that its direction becomes `to` (rad). */
static void load_turn(hf_load *ld, double to)
{
    double by = to - load_direction(ld);
    ld->direction = !ld->no_force ? to : ld->direction;
    for (size_t i = 0; i < ld->ndrag; i++)
        ld->drag[i].direction += by;
}

hf_status hf_model_param_get(const hf_model *m, const hf_param *p, double *value, hf_error *err)
{
    if (!m || !p || p->kind == 0)
        return hf_error_set(err, HF_EINVAL, "parameter: not looked up");
    if (p->kind == P_LOAD_DIRECTION) {
        if (p->index >= m->nloads)
            return hf_error_set(err, HF_EINVAL, "parameter: load %zu outside the model", p->index);
        *value = load_direction(&m->loads[p->index]);
        return HF_OK;
    }
    if (p->kind == P_ANCHOR_RADIUS) {
        if (p->index >= m->nlines)
            return hf_error_set(err, HF_EINVAL, "parameter: line %zu outside the model", p->index);
        *value = anchor_radius(m, &m->lines[p->index]);
        return HF_OK;
    }
    if (!p->value)
        return hf_error_set(err, HF_EINVAL, "parameter: no value to read");
    *value = *p->value;
    return HF_OK;
}

/* The parameters a path can move, for hf_model_param_same: anchor_radius
 * moves both anchor coordinates. */
static int moves_anchor(const hf_param *p, int coord)
{
    return p->kind == P_ANCHOR_RADIUS || p->kind == (coord ? P_ANCHOR_Y : P_ANCHOR_X);
}

int hf_model_param_same(const hf_param *a, const hf_param *b)
{
    if (a->kind == b->kind)
        return a->index == b->index && a->sub == b->sub;
    int anchors = (a->kind == P_ANCHOR_RADIUS || a->kind == P_ANCHOR_X || a->kind == P_ANCHOR_Y) &&
                  (b->kind == P_ANCHOR_RADIUS || b->kind == P_ANCHOR_X || b->kind == P_ANCHOR_Y);
    if (!anchors || a->index != b->index)
        return 0;
    return (moves_anchor(a, 0) && moves_anchor(b, 0)) || (moves_anchor(a, 1) && moves_anchor(b, 1));
}

/* The range a parameter's value must lie in, before anything is set. */
static hf_status check_value(const hf_param *p, double value, hf_error *err)
{
    if (!isfinite(value))
        return hf_error_set(err, HF_EINVAL, "parameter: expected a finite value, got %g", value);
    switch (p->kind) {
    case P_SITE_DEPTH:
    case P_SITE_DENSITY:
    case P_COMP_DIAMETER:
    case P_PIECE_LENGTH:
    case P_PIECE_LOAD:
        if (!(value > 0.0))
            return hf_error_set(err, HF_EINVAL, "parameter: expected a positive %s, got %.10g %s",
                                hf_dim_name(p->dim), value, hf_dim_si(p->dim));
        break;
    case P_COMP_PROP:
        if (p->sub == HF_PROP_FRICTION ? !(value >= 0.0) : !(value > 0.0))
            return hf_error_set(err, HF_EINVAL, "parameter: expected a %s %s, got %.10g %s",
                                p->sub == HF_PROP_FRICTION ? "non-negative" : "positive",
                                hf_component_prop_name((hf_component_prop)p->sub), value,
                                hf_dim_si(p->dim));
        break;
    case P_ANCHOR_RADIUS:
        if (!(value > 0.0))
            return hf_error_set(err, HF_EINVAL,
                                "parameter: expected a positive anchor radius, got %.10g m", value);
        break;
    case P_LOAD_FORCE:
        if (!(value >= 0.0))
            return hf_error_set(err, HF_EINVAL,
                                "parameter: expected a load force >= 0, got %.10g N", value);
        break;
    case 0:
        return hf_error_set(err, HF_EINVAL, "parameter: not looked up");
    default:
        break;
    }
    return HF_OK;
}

hf_status hf_model_param_set(hf_model *m, const hf_param *p, double value, hf_error *err)
{
    hf_status st = check_value(p, value, err);
    if (st != HF_OK)
        return st;
    if (p->kind == P_LOAD_DIRECTION) {
        load_turn(&m->loads[p->index], value);
        return HF_OK;
    }
    if (p->kind == P_ANCHOR_RADIUS) {
        hf_model_line *l = &m->lines[p->index];
        double r = anchor_radius(m, l);
        if (!(r > 0.0))
            return hf_error_set(err, HF_EINVAL,
                                "lines[%s].anchor_radius: the anchor sits under the hull reference "
                                "point, so it has no radial direction to move along",
                                l->name);
        double ux = (l->anchor[0] - m->hull.position[0]) / r;
        double uy = (l->anchor[1] - m->hull.position[1]) / r;
        l->anchor[0] = m->hull.position[0] + value * ux;
        l->anchor[1] = m->hull.position[1] + value * uy;
        return HF_OK;
    }
    double old = *p->value;
    hf_component saved;
    memset(&saved, 0, sizeof saved);
    if (p->kind == P_COMP_PROP || p->kind == P_COMP_DIAMETER)
        saved = m->components[p->index].comp;
    if (p->kind == P_COMP_PROP)
        hf_component_give(&m->components[p->index].comp, (hf_component_prop)p->sub, value);
    else
        *p->value = value;
    st = HF_OK;
    switch (p->kind) {
    case P_ANCHOR_X:
    case P_ANCHOR_Y:
    case P_LOAD_FORCE:
    case P_LOAD_DIRECTION:
    case P_LOAD_MOMENT:
    case P_HULL_HEADING:
    case P_HULL_X:
    case P_HULL_Y:
        return HF_OK; /* nothing derived depends on these */
    case P_FAIRLEAD:
    case P_SITE_LEVEL:
        st = check_geometry(m, err);
        if (st != HF_OK)
            *p->value = old;
        return st;
    case P_PIECE_LENGTH:
    case P_PIECE_LOAD:
        st = build_line(m, &m->lines[p->index], err);
        if (st != HF_OK) {
            *p->value = old;
            build_line(m, &m->lines[p->index], NULL);
        }
        return st;
    default:
        st = hf_model_resolve(m, err);
        if (st != HF_OK) {
            /* Put the model back as it was, keeping the first message. */
            if (p->kind == P_COMP_PROP || p->kind == P_COMP_DIAMETER)
                m->components[p->index].comp = saved;
            else
                *p->value = old;
            hf_model_resolve(m, NULL);
        }
        return st;
    }
}
