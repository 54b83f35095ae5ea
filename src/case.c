/* case.c - reads a YAML case file (libyaml events) into an hf_model, with located errors. */
#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <yaml.h>
#include "holdfast/alloc.h"
#include "holdfast/case.h"
#include "holdfast/criteria.h"
#include "holdfast/hint.h"
#include "holdfast/outputs.h"
#include "holdfast/study.h"
#include "case_tree.h" /* node, ctx (shared with case_env.c) */

/* Largest number of points of one range written in a case file. */
#define MAX_RANGE_POINTS 100000000.0
/* Largest number of entries in one line's sections list (component sections
 * plus clumps and buoys); component sections alone are limited by
 * HF_LINE_MAX_SECTIONS. */
#define MAX_PIECES (4 * HF_LINE_MAX_SECTIONS)

/* ---- a small document tree built from libyaml events ---- */

static void node_free(node *n)
{
    if (!n)
        return;
    for (size_t i = 0; i < n->n; i++)
        node_free(n->kids[i]);
    hf_free(n->kids);
    hf_free(n->text);
    hf_free(n);
}

static int node_add(node *parent, node *kid)
{
    if (parent->n == parent->cap) {
        size_t cap = parent->cap ? 2 * parent->cap : 8;
        node **k = hf_realloc(parent->kids, cap * sizeof *k);
        if (!k)
            return 0;
        parent->kids = k;
        parent->cap = cap;
    }
    parent->kids[parent->n++] = kid;
    return 1;
}

static size_t push(ctx *c, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

/* Appends to the key path; returns the previous length for pop(). */
static size_t push(ctx *c, const char *fmt, ...)
{
    size_t mark = c->plen;
    if (c->plen < sizeof c->path - 1) {
        va_list ap;
        va_start(ap, fmt);
        int k = vsnprintf(c->path + c->plen, sizeof c->path - c->plen, fmt, ap);
        va_end(ap);
        if (k > 0)
            c->plen +=
                (size_t)k < sizeof c->path - c->plen ? (size_t)k : sizeof c->path - 1 - c->plen;
    }
    return mark;
}

static void pop(ctx *c, size_t mark)
{
    c->plen = mark;
    c->path[mark] = '\0';
}

static size_t pushkey(ctx *c, const char *key)
{
    return push(c, c->plen ? ".%s" : "%s", key);
}

static hf_status failv(ctx *c, hf_status s, const node *n, const char *fmt, va_list ap)
{
    char msg[HF_ERROR_TEXT];
    vsnprintf(msg, sizeof msg, fmt, ap);
    int line = n ? n->line : 1, col = n ? n->col : 1;
    if (c->plen)
        return hf_error_set(c->err, s, "%s:%d:%d: %s: %s", c->file, line, col, c->path, msg);
    return hf_error_set(c->err, s, "%s:%d:%d: %s", c->file, line, col, msg);
}

static hf_status fail(ctx *c, const node *n, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;
static hf_status fail(ctx *c, const node *n, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    hf_status s = failv(c, HF_EINVAL, n, fmt, ap);
    va_end(ap);
    return s;
}

static hf_status fail_limit(ctx *c, const node *n, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;
static hf_status fail_limit(ctx *c, const node *n, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    hf_status s = failv(c, HF_ELIMIT, n, fmt, ap);
    va_end(ap);
    return s;
}

static hf_status nomem(ctx *c)
{
    return hf_error_set(c->err, HF_ENOMEM, "%s: out of memory while loading the case", c->file);
}

/* What a node is, for "got ..." in messages (buf holds at least 80 bytes). */
static const char *got(const node *n, char *buf, size_t cap)
{
    if (!n)
        return "nothing";
    if (n->type == N_MAP)
        return "a mapping";
    if (n->type == N_SEQ)
        return "a list";
    if (n->plain && !n->text[0])
        return "nothing (an empty value)";
    size_t len = strlen(n->text);
    if (len > 60)
        snprintf(buf, cap, "\"%.57s...\"", n->text);
    else
        snprintf(buf, cap, "\"%s\"", n->text);
    for (char *p = buf; *p; p++)
        if ((unsigned char)*p < 0x20)
            *p = ' ';
    return buf;
}

#define GOT(n) got((n), gotbuf, sizeof gotbuf)

/* "a" or "an" before a word. */
static const char *article(const char *w)
{
    return strchr("aeiou", w[0]) ? "an" : "a";
}

/* ---- generic checks ---- */

static int is_null(const node *n)
{
    return !n || (n->type == N_SCALAR && n->plain &&
                  (!n->text[0] || !strcmp(n->text, "~") || !strcmp(n->text, "null") ||
                   !strcmp(n->text, "Null") || !strcmp(n->text, "NULL")));
}

/* Checks that n is a mapping whose keys are scalars, unique, and (when keys
 * is not NULL) among keys.  `what` names the mapping for messages. */
static hf_status map_check(ctx *c, const node *n, const char *what, const char *const *keys,
                           const char *dupwhat)
{
    char gotbuf[96], hb[96];
    if (!n || n->type != N_MAP)
        return fail(c, n, "expected %s (a mapping of keys to values), got %s", what, GOT(n));
    for (size_t i = 0; i < n->n; i += 2) {
        const node *k = n->kids[i];
        if (k->type != N_SCALAR)
            return fail(c, k, "expected a key name in %s, got %s", what, GOT(k));
        for (size_t j = 0; j < i; j += 2)
            if (!strcmp(n->kids[j]->text, k->text)) {
                size_t mark = pushkey(c, k->text);
                hf_status s = fail(c, k, "expected each %s once, got \"%s\" again (first at %d:%d)",
                                   dupwhat, k->text, n->kids[j]->line, n->kids[j]->col);
                pop(c, mark);
                return s;
            }
        if (!keys)
            continue;
        int known = 0;
        hf_hint h = {NULL, 0};
        for (const char *const *q = keys; *q; q++) {
            if (!strcmp(*q, k->text))
                known = 1;
            hf_hint_try(&h, k->text, *q);
        }
        if (!known && i >= 2 && isdigit((unsigned char)k->text[0]) && is_null(n->kids[i + 1]) &&
            n->kids[i - 1]->type == N_SCALAR) {
            const node *prev = n->kids[i - 1];
            return fail(c, k,
                        "expected a key of %s, got \"%s\": a decimal comma? in a {...} "
                        "mapping a comma separates entries: write \"%s.%s\" (decimals "
                        "with a point)",
                        what, k->text, prev->text, k->text);
        }
        if (!known) {
            char list[400];
            size_t len = 0;
            list[0] = '\0';
            for (const char *const *q = keys; *q && len < sizeof list - 40; q++)
                len += (size_t)snprintf(list + len, sizeof list - len, "%s%s", len ? ", " : "", *q);
            return fail(c, k, "expected a key of %s (%s), got \"%s\"%s", what, list, k->text,
                        hf_hint_text(&h, hb, sizeof hb));
        }
    }
    return HF_OK;
}

/* The value of `key` in a mapping, or NULL.  Keys that are not scalars are
 * skipped: get() may run before map_check() has vetted the keys. */
static const node *get(const node *map, const char *key)
{
    if (!map || map->type != N_MAP)
        return NULL;
    for (size_t i = 0; i + 1 < map->n; i += 2)
        if (map->kids[i]->type == N_SCALAR && !strcmp(map->kids[i]->text, key))
            return map->kids[i + 1];
    return NULL;
}

/* The key node for `key` (for locating duplicate-name errors). */
static const node *getkey(const node *map, const char *key)
{
    if (!map || map->type != N_MAP)
        return NULL;
    for (size_t i = 0; i + 1 < map->n; i += 2)
        if (map->kids[i]->type == N_SCALAR && !strcmp(map->kids[i]->text, key))
            return map->kids[i];
    return NULL;
}

static hf_status missing(ctx *c, const node *map, const char *key, const char *what)
{
    size_t mark = pushkey(c, key);
    hf_status s = fail(c, map, "expected %s (required), got nothing", what);
    pop(c, mark);
    return s;
}

/* When text reads as a number with a decimal comma ("76,5 mm"), the same
 * with a point into buf and 1; else 0. */
static int decimal_comma(const char *text, char *buf, size_t cap)
{
    const char *comma = strchr(text, ',');
    if (!comma || comma == text || strchr(comma + 1, ',') || strlen(text) >= cap ||
        !isdigit((unsigned char)comma[-1]) || !isdigit((unsigned char)comma[1]))
        return 0;
    strcpy(buf, text);
    buf[comma - text] = '.';
    return 1;
}

/* A quantity of dimension dim from a scalar node. */
static hf_status quantity(ctx *c, const node *n, hf_dim dim, double *out)
{
    char gotbuf[96];
    const char *dn = hf_dim_name(dim);
    if (!n || n->type != N_SCALAR || is_null(n))
        return fail(c, n, "expected %s %s, got %s", article(dn), dn, GOT(n));
    hf_error sub;
    hf_error_clear(&sub);
    if (hf_units_parse(n->text, dim, out, &sub) == HF_OK)
        return HF_OK;
    char fixed[HF_CASE_MAX_SCALAR + 1];
    if (decimal_comma(n->text, fixed, sizeof fixed))
        return fail(c, n,
                    "expected %s %s, got %s: a decimal comma? write \"%s\" (decimals with "
                    "a point)",
                    article(dn), dn, GOT(n), fixed);
    return fail(c, n, "%s", sub.text);
}

enum { ANY = 0, POSITIVE, NONNEG };

static hf_status quantity_in(ctx *c, const node *n, hf_dim dim, int range, double *out)
{
    char gotbuf[96];
    hf_status s = quantity(c, n, dim, out);
    if (s != HF_OK)
        return s;
    const char *dn = hf_dim_name(dim);
    if (range == POSITIVE && !(*out > 0.0))
        return fail(c, n, "expected a positive %s, got %s", dn, GOT(n));
    if (range == NONNEG && !(*out >= 0.0))
        return fail(c, n, "expected %s %s >= 0, got %s", article(dn), dn, GOT(n));
    return HF_OK;
}

/* Optional key: leaves *out unchanged when absent. */
static hf_status opt_quantity(ctx *c, const node *map, const char *key, hf_dim dim, int range,
                              double *out)
{
    const node *v = get(map, key);
    if (!v)
        return HF_OK;
    size_t mark = pushkey(c, key);
    hf_status s = quantity_in(c, v, dim, range, out);
    pop(c, mark);
    return s;
}

static hf_status req_quantity(ctx *c, const node *map, const char *key, hf_dim dim, int range,
                              double *out)
{
    if (!get(map, key)) {
        const char *dn = hf_dim_name(dim);
        char what[64];
        snprintf(what, sizeof what, "%s %s", range == POSITIVE ? "a positive" : article(dn), dn);
        return missing(c, map, key, what);
    }
    return opt_quantity(c, map, key, dim, range, out);
}

/* A list of exactly k quantities, dims[i] each. */
static hf_status vector(ctx *c, const node *n, size_t k, const hf_dim *dims, const char *what,
                        double *out)
{
    char gotbuf[96];
    if (!n || n->type != N_SEQ || n->n != k) {
        if (n && n->type == N_SEQ)
            return fail(c, n, "expected %s (a list of %zu numbers), got a list of %zu", what, k,
                        n->n);
        return fail(c, n, "expected %s (a list of %zu numbers), got %s", what, k, GOT(n));
    }
    for (size_t i = 0; i < k; i++) {
        size_t mark = push(c, "[%zu]", i);
        hf_status s = quantity(c, n->kids[i], dims[i], &out[i]);
        pop(c, mark);
        if (s != HF_OK)
            return s;
    }
    return HF_OK;
}

/* A value of a varied parameter (list entry, range or bracket end): as
 * quantity(), but an angle keeps its whole turns (hf_study_parse_value). */
static hf_status varied(ctx *c, const node *n, hf_dim dim, double *out)
{
    hf_status st = quantity(c, n, dim, out);
    if (st == HF_OK && dim == HF_DIM_ANGLE)
        st = hf_study_parse_value(n->text, dim, out, NULL);
    return st;
}

/* A list of k varied values of one dimension (a range or a bracket). */
static hf_status varied_list(ctx *c, const node *n, size_t k, hf_dim dim, const char *what,
                             double *out)
{
    const hf_dim dims[3] = {dim, dim, dim};
    hf_status st = vector(c, n, k, dims, what, out);
    for (size_t i = 0; st == HF_OK && i < k && dim == HF_DIM_ANGLE; i++)
        st = varied(c, n->kids[i], dim, &out[i]);
    return st;
}

static hf_status text(ctx *c, const node *n, const char *what, const char **out)
{
    char gotbuf[96];
    if (!n || n->type != N_SCALAR || is_null(n))
        return fail(c, n, "expected %s, got %s", what, GOT(n));
    *out = n->text;
    return HF_OK;
}

/* A name: letters, digits, '_' and '-', at most HF_MODEL_MAX_NAME bytes. */
static hf_status name_check(ctx *c, const node *n, const char *what)
{
    char gotbuf[96];
    const char *t;
    hf_status s = text(c, n, what, &t);
    if (s != HF_OK)
        return s;
    size_t len = strlen(t);
    if (len == 0)
        return fail(c, n,
                    "expected %s of at least one letter, digit, '_' or '-', got an empty "
                    "name",
                    what);
    if (len > HF_MODEL_MAX_NAME)
        return fail_limit(c, n,
                          "expected %s of at most %d bytes (HF_MODEL_MAX_NAME), got %zu bytes",
                          what, HF_MODEL_MAX_NAME, len);
    for (const char *p = t; *p; p++)
        if (!((*p >= 'a' && *p <= 'z') || (*p >= 'A' && *p <= 'Z') || (*p >= '0' && *p <= '9') ||
              *p == '_' || *p == '-'))
            return fail(c, n, "expected %s made of letters, digits, '_' and '-', got %s", what,
                        GOT(n));
    return HF_OK;
}

static hf_status name_dup(ctx *c, const node *n, const char *what, char **out)
{
    hf_status s = name_check(c, n, what);
    if (s != HF_OK)
        return s;
    *out = hf_strdup(n->text);
    return *out ? HF_OK : nomem(c);
}

/* Picks word among names[0..n-1] (NULL-terminated when n is (size_t)-1). */
static hf_status choose(ctx *c, const node *n, const char *what, const char *const *names,
                        size_t count, size_t *out)
{
    const char *t;
    hf_status s = text(c, n, what, &t);
    if (s != HF_OK)
        return s;
    hf_hint h = {NULL, 0};
    char list[300], hb[96];
    size_t len = 0;
    list[0] = '\0';
    for (size_t i = 0; i < count; i++) {
        if (!strcmp(names[i], t)) {
            *out = i;
            return HF_OK;
        }
        hf_hint_try(&h, t, names[i]);
        if (len < sizeof list - 40)
            len +=
                (size_t)snprintf(list + len, sizeof list - len, "%s%s", len ? ", " : "", names[i]);
    }
    return fail(c, n, "expected %s (%s), got \"%s\"%s", what, list, t,
                hf_hint_text(&h, hb, sizeof hb));
}

/* ---- site ---- */

static const char *const site_keys[] = {"depth", "water_density", "water_level", "water_levels",
                                        NULL};

/* site.water_levels (helper A, issue 13): a list of still water levels; a
 * list of two is the range [low, high], expanded to low, low + 0.1 m, ...
 * and high itself (HF_MODEL_LEVEL_STEP), each rounded to 1e-9 m so that 1.9
 * is the double a case file's "1.9 m" gives (correctly rounded division).  Each level must lie
 * above the seabed; a range needs low < high. */
static hf_status water_levels(ctx *c, const node *n, hf_site *s)
{
    char gotbuf[96];
    if (n->type != N_SEQ || n->n == 0 || n->n > HF_MODEL_MAX_LEVELS)
        return fail(c, n,
                    "expected a list of water levels ([low, high] or up to %d levels), got %s",
                    HF_MODEL_MAX_LEVELS, n->type == N_SEQ ? "an empty or too long list" : GOT(n));
    double v[HF_MODEL_MAX_LEVELS];
    for (size_t i = 0; i < n->n; i++) {
        size_t mark = push(c, "[%zu]", i);
        hf_status st = quantity(c, n->kids[i], HF_DIM_LENGTH, &v[i]);
        if (st == HF_OK && !(s->depth + v[i] > 0.0))
            st = fail(c, n->kids[i], "expected a water level above the seabed (> -%g m), got %s",
                      s->depth, GOT(n->kids[i]));
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    s->water_levels_range = n->n == 2;
    if (n->n != 2) {
        memcpy(s->water_levels, v, n->n * sizeof *v);
        s->nwater_levels = n->n;
        return HF_OK;
    }
    double span = (v[1] - v[0]) / HF_MODEL_LEVEL_STEP;
    if (!(span > 0.0) || span > HF_MODEL_MAX_LEVELS - 2)
        return fail(c, n,
                    "expected [low, high] with low < high and at most %d levels %g m apart, "
                    "got [%s, %s]",
                    HF_MODEL_MAX_LEVELS, HF_MODEL_LEVEL_STEP, n->kids[0]->text, n->kids[1]->text);
    size_t k = 0;
    while (k < HF_MODEL_MAX_LEVELS - 1 && (double)k < span - 1e-6)
        s->water_levels[k] = round((v[0] + (double)k * HF_MODEL_LEVEL_STEP) * 1e9) / 1e9, k++;
    s->water_levels[k++] = v[1];
    s->nwater_levels = k;
    return HF_OK;
}

static hf_status load_site(ctx *c, const node *n)
{
    hf_site *s = &c->m->site;
    hf_status st = map_check(c, n, "the site", site_keys, "key");
    if (st == HF_OK)
        st = req_quantity(c, n, "depth", HF_DIM_LENGTH, POSITIVE, &s->depth);
    if (st == HF_OK)
        st = opt_quantity(c, n, "water_density", HF_DIM_DENSITY, POSITIVE, &s->water_density);
    if (st == HF_OK)
        st = opt_quantity(c, n, "water_level", HF_DIM_LENGTH, ANY, &s->water_level);
    if (st == HF_OK && !(s->depth + s->water_level > 0.0)) {
        char gotbuf[96];
        size_t mark = pushkey(c, "water_level");
        st = fail(c, get(n, "water_level"),
                  "expected a water level above the seabed (> -%g m), got %s", s->depth,
                  GOT(get(n, "water_level")));
        pop(c, mark);
    }
    if (st == HF_OK && get(n, "water_levels")) {
        size_t mark = pushkey(c, "water_levels");
        st = water_levels(c, get(n, "water_levels"), s);
        pop(c, mark);
    }
    return st;
}

/* ---- components ---- */

static const char *const comp_keys[] = {"type",          "grade",           "diameter",
                                        "mass",          "wet_weight",      "axial_stiffness",
                                        "breaking_load", "seabed_friction", NULL};

static hf_status load_component(ctx *c, const node *key, const node *n, hf_model_component *mc)
{
    hf_status st = map_check(c, n, "a component", comp_keys, "key");
    if (st != HF_OK)
        return st;
    mc->name = hf_strdup(key->text);
    if (!mc->name)
        return nomem(c);
    mc->src_line = key->line;
    mc->src_col = key->col;
    const node *tn = get(n, "type");
    if (!tn)
        return missing(c, n, "type", "a component type");
    const char *types[HF_COMP_TYPE_COUNT];
    for (int i = 0; i < HF_COMP_TYPE_COUNT; i++)
        types[i] = hf_component_type_name((hf_component_type)i);
    size_t t, mark = pushkey(c, "type");
    st = choose(c, tn, "a component type", types, HF_COMP_TYPE_COUNT, &t);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    hf_component *comp = &mc->comp;
    hf_component_init(comp, (hf_component_type)t);
    const node *gn = get(n, "grade");
    if (gn) {
        mark = pushkey(c, "grade");
        if (!hf_component_is_chain(comp->type)) {
            st = fail(c, gn,
                      "expected no grade: only studless_chain and studlink_chain take one, "
                      "got a grade for a %s",
                      types[t]);
        } else {
            const char *grades[HF_GRADE_COUNT - 1];
            for (int i = 1; i < HF_GRADE_COUNT; i++)
                grades[i - 1] = hf_component_grade_name((hf_chain_grade)i);
            size_t g;
            st = choose(c, gn, "a chain grade", grades, HF_GRADE_COUNT - 1, &g);
            comp->grade = (hf_chain_grade)(g + 1);
        }
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    st = opt_quantity(c, n, "diameter", HF_DIM_LENGTH, POSITIVE, &comp->diameter);
    static const struct {
        const char *key;
        hf_component_prop prop;
        hf_dim dim;
        int range;
    } props[] = {
        {"mass", HF_PROP_MASS, HF_DIM_MASS_PER_LENGTH, POSITIVE},
        {"wet_weight", HF_PROP_WET_WEIGHT, HF_DIM_FORCE_PER_LENGTH, POSITIVE},
        {"axial_stiffness", HF_PROP_EA, HF_DIM_FORCE, POSITIVE},
        {"breaking_load", HF_PROP_MBL, HF_DIM_FORCE, POSITIVE},
        {"seabed_friction", HF_PROP_FRICTION, HF_DIM_NONE, NONNEG},
    };
    for (size_t i = 0; st == HF_OK && i < sizeof props / sizeof props[0]; i++) {
        double v = 0.0;
        if (!get(n, props[i].key))
            continue;
        st = opt_quantity(c, n, props[i].key, props[i].dim, props[i].range, &v);
        if (st == HF_OK)
            hf_component_give(comp, props[i].prop, v);
    }
    if (st != HF_OK)
        return st;
    hf_error sub;
    hf_error_clear(&sub);
    if (hf_component_resolve(comp, c->m->site.water_density, &sub) != HF_OK)
        return fail(c, n, "%s", sub.text);
    return HF_OK;
}

static hf_status load_components(ctx *c, const node *n)
{
    hf_status st = map_check(c, n, "the component catalogue", NULL, "component name");
    if (st != HF_OK)
        return st;
    if (n->n == 0)
        return fail(c, n, "expected at least one component, got none");
    size_t count = n->n / 2;
    c->m->components = hf_calloc(count, sizeof *c->m->components);
    if (!c->m->components)
        return nomem(c);
    c->m->ncomponents = count;
    for (size_t i = 0; i < count; i++) {
        const node *k = n->kids[2 * i];
        size_t mark = pushkey(c, k->text);
        st = name_check(c, k, "a component name");
        if (st == HF_OK)
            st = load_component(c, k, n->kids[2 * i + 1], &c->m->components[i]);
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    return HF_OK;
}

/* ---- lines ---- */

static hf_status factor(ctx *c, const node *map, const char *key, double *out);

static const char *const line_keys[] = {"name",
                                        "anchor",
                                        "fairlead",
                                        "sections",
                                        "anchor_kind",
                                        "block_weight",
                                        "block_friction",
                                        "max_uplift",
                                        "block_sliding_factor",
                                        "block_uplift_factor",
                                        NULL};
static const char *const piece_keys[] = {"component", "length", "clump", "buoy", "friction", NULL};
static const char *const anchor_kinds[] = {"drag", "gravity", "pile", "plate"};

static hf_status load_piece(ctx *c, const node *n, hf_piece *p)
{
    char gotbuf[96];
    hf_status st = map_check(c, n, "a sections entry", piece_keys, "key");
    if (st != HF_OK)
        return st;
    const node *cn = get(n, "component"), *ln = get(n, "length"), *kn = get(n, "clump"),
               *bn = get(n, "buoy"), *fn = get(n, "friction");
    int kinds = (cn != NULL) + (kn != NULL) + (bn != NULL);
    if (kinds != 1)
        return fail(c, n,
                    "expected one of {component: NAME, length: L}, {clump: FORCE} or "
                    "{buoy: FORCE}, got %s",
                    kinds ? "more than one of component, clump and buoy" : "none of them");
    if (cn) {
        if (fn) {
            size_t mark = pushkey(c, "friction");
            st = fail(c, getkey(n, "friction"),
                      "expected no friction on a component section (give seabed_friction in "
                      "the component), got %s",
                      GOT(fn));
            pop(c, mark);
            return st;
        }
        size_t mark = pushkey(c, "component");
        const char *name;
        st = text(c, cn, "a component name", &name);
        if (st == HF_OK) {
            p->component = hf_model_component_find(c->m, name);
            if (p->component == (size_t)-1) {
                hf_hint h = {NULL, 0};
                char list[300], hb[96];
                size_t len = 0;
                list[0] = '\0';
                for (size_t i = 0; i < c->m->ncomponents; i++) {
                    hf_hint_try(&h, name, c->m->components[i].name);
                    if (len < sizeof list - 40)
                        len += (size_t)snprintf(list + len, sizeof list - len, "%s%s",
                                                len ? ", " : "", c->m->components[i].name);
                }
                st = fail(c, cn, "expected the name of a component (%s), got \"%s\"%s", list, name,
                          hf_hint_text(&h, hb, sizeof hb));
            }
        }
        pop(c, mark);
        if (st != HF_OK)
            return st;
        p->kind = HF_PIECE_SECTION;
        if (!ln)
            return missing(c, n, "length", "a positive length");
        return opt_quantity(c, n, "length", HF_DIM_LENGTH, POSITIVE, &p->length);
    }
    if (ln) {
        size_t mark = pushkey(c, "length");
        st = fail(c, getkey(n, "length"), "expected no length on a clump or buoy, got %s", GOT(ln));
        pop(c, mark);
        return st;
    }
    p->kind = kn ? HF_PIECE_CLUMP : HF_PIECE_BUOY;
    p->friction = 1.0;
    st = opt_quantity(c, n, kn ? "clump" : "buoy", HF_DIM_FORCE, POSITIVE, &p->load);
    if (st == HF_OK)
        st = opt_quantity(c, n, "friction", HF_DIM_NONE, NONNEG, &p->friction);
    return st;
}

static hf_status load_sections(ctx *c, const node *n, hf_model_line *l)
{
    char gotbuf[96];
    if (!n || n->type != N_SEQ)
        return fail(c, n, "expected a list of sections from anchor to fairlead, got %s", GOT(n));
    if (n->n == 0)
        return fail(c, n,
                    "expected at least one section ({component: NAME, length: L}), got an "
                    "empty list");
    if (n->n > MAX_PIECES)
        return fail_limit(c, n, "expected at most %d entries, got %zu", MAX_PIECES, n->n);
    l->pieces = hf_calloc(n->n, sizeof *l->pieces);
    if (!l->pieces)
        return nomem(c);
    l->npieces = n->n;
    size_t nsec = 0;
    for (size_t k = 0; k < n->n; k++) {
        size_t mark = push(c, "[%zu]", k);
        hf_status st = load_piece(c, n->kids[k], &l->pieces[k]);
        if (st == HF_OK && l->pieces[k].kind == HF_PIECE_SECTION && ++nsec > HF_LINE_MAX_SECTIONS)
            st = fail_limit(c, n->kids[k],
                            "expected at most %d component sections per line "
                            "(HF_LINE_MAX_SECTIONS), got more",
                            HF_LINE_MAX_SECTIONS);
        if (st == HF_OK && l->pieces[k].kind != HF_PIECE_SECTION) {
            int at_anchor = nsec == 0, at_end = 1;
            /* Later entries are not loaded yet: look at their text. */
            for (size_t q = k + 1; q < n->n; q++)
                if (get(n->kids[q], "component"))
                    at_end = 0;
            if (at_anchor || at_end)
                st = fail(c, n->kids[k],
                          "expected a clump or buoy between two component sections, got one at "
                          "the %s end",
                          at_anchor ? "anchor" : "fairlead");
        }
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    return HF_OK;
}

/* Refuses a name made of digits only: parameter paths take a line or a load
 * by name or by index (lines[1], loads[0]), and such a name would shadow an
 * index. */
static hf_status not_a_number(ctx *c, const node *nn, const char *what, const char *form)
{
    char gotbuf[96];
    if (nn->text[strspn(nn->text, "0123456789")] != '\0')
        return HF_OK;
    return fail(c, nn,
                "expected %s with at least one letter, '_' or '-' (a number would be read "
                "as an index in %s), got %s",
                what, form, GOT(nn));
}

/* A line's name: valid, unique, not empty and not a plain number (a line
 * named "1" would shadow index 1 in parameter paths such as lines[1]). */
static hf_status line_name(ctx *c, const node *n, size_t index)
{
    hf_model *m = c->m;
    hf_model_line *l = &m->lines[index];
    const node *nn = get(n, "name");
    if (!nn)
        return missing(c, n, "name", "a line name");
    size_t mark = pushkey(c, "name");
    hf_status st = name_dup(c, nn, "a line name", &l->name);
    if (st == HF_OK)
        st = not_a_number(c, nn, "a line name", "lines[INDEX]");
    for (size_t j = 0; st == HF_OK && j < index; j++)
        if (!strcmp(m->lines[j].name, l->name))
            st = fail(c, nn, "expected a unique line name, got \"%s\" again (first at %d:%d)",
                      l->name, m->lines[j].src_line, m->lines[j].src_col);
    pop(c, mark);
    return st;
}

/* The anchor's global [x, y] and the fairlead's hull-frame [x, y, z]. */
static hf_status line_ends(ctx *c, const node *n, hf_model_line *l)
{
    char gotbuf[96];
    static const hf_dim len3[3] = {HF_DIM_LENGTH, HF_DIM_LENGTH, HF_DIM_LENGTH};
    const node *an = get(n, "anchor"), *fl = get(n, "fairlead");
    if (!an)
        return missing(c, n, "anchor", "the anchor's global [x, y]");
    size_t mark = pushkey(c, "anchor");
    hf_status st = vector(c, an, 2, len3, "the anchor's global [x, y]", l->anchor);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    if (!fl)
        return missing(c, n, "fairlead", "the fairlead's hull-frame [x, y, z]");
    mark = pushkey(c, "fairlead");
    st = vector(c, fl, 3, len3, "the fairlead's hull-frame [x, y, z]", l->fairlead);
    double seabed = -hf_model_water_height(c->m);
    if (st == HF_OK && l->fairlead[2] < seabed) {
        size_t m2 = push(c, "[2]");
        st = fail(c, fl->kids[2],
                  "expected a fairlead above the seabed (z >= %g m in the hull frame), got %s",
                  seabed, GOT(fl->kids[2]));
        pop(c, m2);
    } else if (st == HF_OK && l->fairlead[2] > 0.0) {
        /* Issue 12 item 2: the model uses submerged weights, so no point of a
         * line may be above the still water level (z = 0 in the hull frame). */
        size_t m2 = push(c, "[2]");
        st = fail(c, fl->kids[2],
                  "expected a fairlead at or below the still water level (z <= 0 m in the "
                  "hull frame: lines are modelled with their submerged weight), got %s",
                  GOT(fl->kids[2]));
        pop(c, m2);
    }
    pop(c, mark);
    return st;
}

/* anchor_kind and the keys that go with it. */
static hf_status line_anchor(ctx *c, const node *n, hf_anchor *a)
{
    char gotbuf[96];
    a->kind = HF_ANCHOR_DRAG;
    a->friction = 0.5;
    const node *kn = get(n, "anchor_kind");
    if (kn) {
        size_t k, mark = pushkey(c, "anchor_kind");
        hf_status st = choose(c, kn, "an anchor kind", anchor_kinds, 4, &k);
        pop(c, mark);
        if (st != HF_OK)
            return st;
        a->kind = (hf_anchor_kind)k;
    }
    static const struct {
        const char *key;
        hf_anchor_kind kind;
    } only[] = {{"block_weight", HF_ANCHOR_GRAVITY},
                {"block_friction", HF_ANCHOR_GRAVITY},
                {"max_uplift", HF_ANCHOR_DRAG},
                {"block_sliding_factor", HF_ANCHOR_GRAVITY},
                {"block_uplift_factor", HF_ANCHOR_GRAVITY}};
    for (size_t i = 0; i < sizeof only / sizeof only[0]; i++)
        if (get(n, only[i].key) && a->kind != only[i].kind) {
            size_t mark = pushkey(c, only[i].key);
            hf_status st = fail(c, getkey(n, only[i].key),
                                "expected %s only with anchor_kind: %s, got it for a %s anchor",
                                only[i].key, anchor_kinds[only[i].kind], anchor_kinds[a->kind]);
            pop(c, mark);
            return st;
        }
    hf_status st = HF_OK;
    if (a->kind == HF_ANCHOR_GRAVITY) {
        st = req_quantity(c, n, "block_weight", HF_DIM_FORCE, POSITIVE, &a->weight);
        if (st == HF_OK)
            st = opt_quantity(c, n, "block_friction", HF_DIM_NONE, NONNEG, &a->friction);
        if (st == HF_OK) /* helper A, issue 13: required factors of this block */
            st = factor(c, n, "block_sliding_factor", &a->required_sliding);
        if (st == HF_OK)
            st = factor(c, n, "block_uplift_factor", &a->required_uplift);
    } else if (a->kind == HF_ANCHOR_DRAG) {
        st = opt_quantity(c, n, "max_uplift", HF_DIM_ANGLE, NONNEG, &a->max_uplift_angle);
        if (st == HF_OK && !(a->max_uplift_angle < M_PI / 2)) {
            size_t mark = pushkey(c, "max_uplift");
            st = fail(c, get(n, "max_uplift"), "expected an angle from 0 to below 90 deg, got %s",
                      GOT(get(n, "max_uplift")));
            pop(c, mark);
        }
    }
    return st;
}

static hf_status load_line(ctx *c, const node *n, size_t index)
{
    hf_model_line *l = &c->m->lines[index];
    hf_status st = map_check(c, n, "a line", line_keys, "key");
    if (st != HF_OK)
        return st;
    l->src_line = n->line;
    l->src_col = n->col;
    if ((st = line_name(c, n, index)) != HF_OK || (st = line_ends(c, n, l)) != HF_OK)
        return st;
    const node *sn = get(n, "sections");
    if (!sn)
        return missing(c, n, "sections", "a list of sections from anchor to fairlead");
    size_t mark = pushkey(c, "sections");
    st = load_sections(c, sn, l);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    return line_anchor(c, n, &l->anchor_spec);
}

static hf_status load_lines(ctx *c, const node *n)
{
    char gotbuf[96];
    if (!n || n->type != N_SEQ)
        return fail(c, n, "expected a list of lines, got %s", GOT(n));
    if (n->n == 0)
        return fail(c, n, "expected at least one line, got an empty list");
    if (n->n > HF_MODEL_MAX_LINES)
        return fail_limit(c, n, "expected at most %d lines (HF_MODEL_MAX_LINES), got %zu",
                          HF_MODEL_MAX_LINES, n->n);
    c->m->lines = hf_calloc(n->n, sizeof *c->m->lines);
    if (!c->m->lines)
        return nomem(c);
    c->m->nlines = n->n;
    for (size_t i = 0; i < n->n; i++) {
        size_t mark = push(c, "[%zu]", i);
        hf_status st = load_line(c, n->kids[i], i);
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    return HF_OK;
}

/* ---- hull ---- */

static const char *const hull_keys[] = {
    "position", "heading", "outline",
    /* issue 14, case_env.c: */
    "mass", "added_mass", "yaw_inertia", "added_yaw_inertia", "damping", "raos", "drift",
    "wind_coefficients", "current_coefficients", "wind_area", "current_area", "length", NULL};

static hf_status load_hull(ctx *c, const node *n)
{
    char gotbuf[96];
    static const hf_dim len2[2] = {HF_DIM_LENGTH, HF_DIM_LENGTH};
    hf_hull *h = &c->m->hull;
    hf_status st = map_check(c, n, "the hull", hull_keys, "key");
    if (st != HF_OK || (st = hf_case_env_hull(c, n)) != HF_OK) /* issue 14: case_env.c */
        return st;
    const node *pn = get(n, "position");
    if (pn) {
        size_t mark = pushkey(c, "position");
        st = vector(c, pn, 2, len2, "the hull position [x, y]", h->position);
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    st = opt_quantity(c, n, "heading", HF_DIM_ANGLE, ANY, &h->heading);
    const node *on = get(n, "outline");
    if (st != HF_OK || !on)
        return st;
    size_t mark = pushkey(c, "outline");
    if (on->type != N_SEQ || on->n < 3) {
        st = fail(c, on, "expected a polygon of at least 3 hull-frame points [x, y], got %s",
                  on->type == N_SEQ ? "fewer" : GOT(on));
    } else {
        h->outline = hf_calloc(on->n, sizeof *h->outline);
        if (!h->outline) {
            st = nomem(c);
        } else {
            h->noutline = on->n;
            for (size_t i = 0; st == HF_OK && i < on->n; i++) {
                size_t m2 = push(c, "[%zu]", i);
                st = vector(c, on->kids[i], 2, len2, "a hull-frame point [x, y]", h->outline[i]);
                pop(c, m2);
            }
        }
    }
    pop(c, mark);
    return st;
}

/* ---- loads ---- */

static const char *const load_keys[] = {"name", "force",   "direction", "moment",
                                        "wind", "current", NULL};
static const char *const drag_keys[] = {"speed", "direction", "coefficient",
                                        "area",  "density",   NULL};

static hf_status load_drag(ctx *c, const node *n, const char *what, double density, hf_drag *d)
{
    hf_status st = map_check(c, n, what, drag_keys, "key");
    d->density = density;
    if (st == HF_OK)
        st = req_quantity(c, n, "speed", HF_DIM_SPEED, NONNEG, &d->speed);
    if (st == HF_OK)
        st = req_quantity(c, n, "direction", HF_DIM_ANGLE, ANY, &d->direction);
    if (st == HF_OK)
        st = req_quantity(c, n, "coefficient", HF_DIM_NONE, POSITIVE, &d->coefficient);
    if (st == HF_OK)
        st = req_quantity(c, n, "area", HF_DIM_AREA, POSITIVE, &d->area);
    if (st == HF_OK)
        st = opt_quantity(c, n, "density", HF_DIM_DENSITY, POSITIVE, &d->density);
    return st;
}

static hf_status load_load(ctx *c, const node *n, size_t index, int *lines, int *cols)
{
    char gotbuf[96];
    hf_model *m = c->m;
    hf_load *ld = &m->loads[index];
    hf_status st = map_check(c, n, "a load case", load_keys, "key");
    if (st != HF_OK)
        return st;
    lines[index] = n->line;
    cols[index] = n->col;
    const node *nn = get(n, "name");
    if (!nn)
        return missing(c, n, "name", "a load name");
    size_t mark = pushkey(c, "name");
    st = name_dup(c, nn, "a load name", &ld->name);
    if (st == HF_OK)
        st = not_a_number(c, nn, "a load name", "loads[INDEX]");
    for (size_t j = 0; st == HF_OK && j < index; j++)
        if (!strcmp(m->loads[j].name, ld->name))
            st = fail(c, nn, "expected a unique load name, got \"%s\" again (first at %d:%d)",
                      ld->name, lines[j], cols[j]);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    const node *fn = get(n, "force"), *dn = get(n, "direction");
    ld->no_force = fn == NULL;
    if (fn && fn->type == N_SEQ) {
        static const hf_dim f2[2] = {HF_DIM_FORCE, HF_DIM_FORCE};
        double f[2];
        mark = pushkey(c, "force");
        st = vector(c, fn, 2, f2, "a force [fx, fy]", f);
        pop(c, mark);
        if (st != HF_OK)
            return st;
        if (dn) {
            mark = pushkey(c, "direction");
            st = fail(c, getkey(n, "direction"),
                      "expected no direction with a force given as [fx, fy], got %s", GOT(dn));
            pop(c, mark);
            return st;
        }
        ld->force = hypot(f[0], f[1]);
        ld->direction = ld->force > 0.0 ? atan2(f[1], f[0]) : 0.0;
    } else if (fn) {
        st = opt_quantity(c, n, "force", HF_DIM_FORCE, NONNEG, &ld->force);
        if (st == HF_OK && !dn)
            return missing(c, n, "direction",
                           "the direction of the force (an angle from global x)");
        if (st == HF_OK)
            st = opt_quantity(c, n, "direction", HF_DIM_ANGLE, ANY, &ld->direction);
        if (st != HF_OK)
            return st;
    } else if (dn) {
        mark = pushkey(c, "direction");
        st = fail(c, getkey(n, "direction"), "expected a direction only with a force, got %s",
                  GOT(dn));
        pop(c, mark);
        return st;
    }
    st = opt_quantity(c, n, "moment", HF_DIM_MOMENT, ANY, &ld->moment);
    if (st != HF_OK)
        return st;
    const node *wn = get(n, "wind"), *cn = get(n, "current");
    if (!fn && !wn && !cn && !get(n, "moment"))
        return fail(c, n, "expected at least one of force, moment, wind and current, got none");
    if (wn || cn) {
        ld->drag = hf_calloc(2, sizeof *ld->drag);
        if (!ld->drag)
            return nomem(c);
    }
    if (wn) {
        mark = pushkey(c, "wind");
        /* Air density 1.225 kg/m^3: ISO 2533 standard atmosphere at sea level. */
        st = load_drag(c, wn, "a wind drag (speed, direction, coefficient, area)", 1.225,
                       &ld->drag[ld->ndrag++]);
        pop(c, mark);
    }
    if (st == HF_OK && cn) {
        mark = pushkey(c, "current");
        st = load_drag(c, cn, "a current drag (speed, direction, coefficient, area)",
                       m->site.water_density, &ld->drag[ld->ndrag++]);
        pop(c, mark);
    }
    return st;
}

static hf_status load_loads(ctx *c, const node *n)
{
    char gotbuf[96];
    if (!n || n->type != N_SEQ)
        return fail(c, n, "expected a list of load cases, got %s", GOT(n));
    if (n->n == 0)
        return HF_OK;
    c->m->loads = hf_calloc(n->n, sizeof *c->m->loads);
    int *pos = hf_calloc(2 * n->n, sizeof *pos);
    if (!c->m->loads || !pos) {
        hf_free(pos);
        return nomem(c);
    }
    c->m->nloads = n->n;
    hf_status st = HF_OK;
    for (size_t i = 0; st == HF_OK && i < n->n; i++) {
        size_t mark = push(c, "[%zu]", i);
        st = load_load(c, n->kids[i], i, pos, pos + n->n);
        pop(c, mark);
    }
    hf_free(pos);
    return st;
}

/* ---- criteria ---- */

static const char *const criteria_keys[] = {"preset",
                                            "analysis",
                                            "intact_factor",
                                            "damaged_factor",
                                            "max_offset",
                                            "block_sliding_factor",
                                            "block_uplift_factor",
                                            "anchor_line_friction",
                                            NULL};
static const char *const analysis_names[] = {"quasi-static", "dynamic"};

static hf_status factor(ctx *c, const node *map, const char *key, double *out)
{
    char gotbuf[96];
    const node *v = get(map, key);
    if (!v)
        return HF_OK;
    double f = 0.0;
    hf_status st = opt_quantity(c, map, key, HF_DIM_NONE, NONNEG, &f);
    if (st == HF_OK && f != 0.0 && f < 1.0) {
        size_t mark = pushkey(c, key);
        st = fail(c, v, "expected 0 (no check) or a safety factor >= 1, got %s", GOT(v));
        pop(c, mark);
    }
    if (st == HF_OK)
        *out = f;
    return st;
}

/* The anchor keys of `criteria:` (helper A, issue 13): required gravity-block
 * factors for every line that gives none, and whether anchor loads include
 * the grounded line's seabed friction (include, the default) or not (ignore). */
static hf_status anchor_criteria(ctx *c, const node *n, hf_criteria *cr)
{
    static const char *const friction_names[] = {"include", "ignore"};
    hf_status st = factor(c, n, "block_sliding_factor", &cr->block_sliding);
    if (st == HF_OK)
        st = factor(c, n, "block_uplift_factor", &cr->block_uplift);
    const node *fn = get(n, "anchor_line_friction");
    if (st == HF_OK && fn) {
        size_t k, mark = pushkey(c, "anchor_line_friction");
        st = choose(c, fn, "how anchor loads take the line's seabed friction", friction_names, 2,
                    &k);
        pop(c, mark);
        if (st == HF_OK)
            cr->anchor_ignore_friction = k == 1;
    }
    return st;
}

static hf_status load_criteria(ctx *c, const node *n)
{
    hf_criteria *cr = &c->m->criteria;
    hf_status st = map_check(c, n, "the criteria", criteria_keys, "key");
    if (st != HF_OK)
        return st;
    const node *an = get(n, "analysis");
    if (an) {
        size_t k, mark = pushkey(c, "analysis");
        st = choose(c, an, "an analysis kind", analysis_names, 2, &k);
        pop(c, mark);
        if (st != HF_OK)
            return st;
        cr->analysis = k ? HF_ANALYSIS_DYNAMIC : HF_ANALYSIS_QUASI_STATIC;
    }
    const node *pn = get(n, "preset");
    if (pn) {
        const char *names[32];
        size_t count = hf_criteria_preset_count();
        if (count > 32)
            count = 32;
        for (size_t i = 0; i < count; i++)
            names[i] = hf_criteria_preset_at(i)->name;
        size_t k, mark = pushkey(c, "preset");
        st = choose(c, pn, "a criteria preset", names, count, &k);
        if (st == HF_OK) {
            hf_error sub;
            hf_error_clear(&sub);
            if (hf_criteria_preset_apply(cr, names[k], &sub) != HF_OK)
                st = fail(c, pn, "%s", sub.text);
        }
        pop(c, mark);
        if (st != HF_OK)
            return st;
        cr->preset = hf_strdup(names[k]);
        if (!cr->preset)
            return nomem(c);
    } else {
        cr->source = "factors given in the case file";
    }
    st = factor(c, n, "intact_factor", &cr->factor_intact);
    if (st == HF_OK)
        st = factor(c, n, "damaged_factor", &cr->factor_damaged);
    if (st == HF_OK)
        st = opt_quantity(c, n, "max_offset", HF_DIM_LENGTH, NONNEG, &cr->max_offset);
    if (st == HF_OK)
        st = anchor_criteria(c, n, cr);
    return st;
}

/* ---- studies ---- */

static const char *const kind_names[] = {"lines", "curve",  "stiffness", "balance",
                                         "sweep", "invert", "design"};
static const char *const *const study_keys[] = {
    (const char *const[]){"name", "kind", "offset", NULL},
    (const char *const[]){"name", "kind", "direction", "range", NULL},
    (const char *const[]){"name", "kind", "offset", NULL},
    (const char *const[]){"name", "kind", "loads", NULL},
    (const char *const[]){"name", "kind", "vary", "combine", "outputs", NULL},
    (const char *const[]){"name", "kind", "vary", "target", NULL},
    (const char *const[]){"name", "kind", "environments", NULL}, /* case_env.c */
};
static const char *const study_what[] = {"a lines study",   "a curve study", "a stiffness study",
                                         "a balance study", "a sweep study", "an invert study",
                                         "a design study"};
static const char *const vary_keys[] = {"path", "range", "values", NULL};
static const char *const invert_vary_keys[] = {"path", "range", NULL};
static const char *const target_keys[] = {"output", "line", "value", NULL};

/* Range [from, to, step] of dimension dim (the range rule of
 * hf_study_range_count); counts its points into *count. */
static hf_status range3(ctx *c, const node *n, hf_dim dim, double *from, double *to, double *step,
                        double *count)
{
    double v[3];
    hf_status st = varied_list(c, n, 3, dim, "a range [from, to, step]", v);
    if (st != HF_OK)
        return st;
    size_t k = hf_study_range_count(v[0], v[1], v[2], (size_t)MAX_RANGE_POINTS);
    if (k == 0) {
        size_t mark = push(c, "[2]");
        st = fail(c, n->kids[2], "expected a non-zero step pointing from %s to %s, got \"%s\"",
                  n->kids[0]->text, n->kids[1]->text, n->kids[2]->text);
        pop(c, mark);
        return st;
    }
    if (k > (size_t)MAX_RANGE_POINTS)
        return fail_limit(c, n, "expected at most %.0f points in a range, got more",
                          MAX_RANGE_POINTS);
    *from = v[0];
    *to = v[1];
    *step = v[2];
    if (count)
        *count = (double)k;
    return HF_OK;
}

/* The vary entry's path, checked on the model; the parameter into *p. */
static hf_status param_path(ctx *c, const node *map, hf_vary *v, hf_param *p)
{
    const node *pn = get(map, "path");
    if (!pn)
        return missing(c, map, "path", "a parameter path such as site.depth");
    size_t mark = pushkey(c, "path");
    const char *t;
    hf_status st = text(c, pn, "a parameter path such as site.depth", &t);
    if (st == HF_OK) {
        hf_error sub;
        hf_error_clear(&sub);
        if (hf_model_param_lookup(c->m, t, p, &sub) != HF_OK) {
            st = fail(c, pn, "%s", sub.text);
        } else {
            v->dim = p->dim;
            v->path = hf_strdup(t);
            if (!v->path)
                st = nomem(c);
        }
    }
    pop(c, mark);
    return st;
}

static hf_status vary_values(ctx *c, const node *vn, hf_vary *v, double *count)
{
    char gotbuf[96];
    if (vn->type != N_SEQ || vn->n == 0)
        return fail(c, vn, "expected a non-empty list of values, got %s",
                    vn->type == N_SEQ ? "an empty list" : GOT(vn));
    if (vn->n > MAX_RANGE_POINTS)
        return fail_limit(c, vn, "expected at most %.0f values, got %zu", MAX_RANGE_POINTS, vn->n);
    v->values = hf_calloc(vn->n, sizeof *v->values);
    if (!v->values)
        return nomem(c);
    v->nvalues = vn->n;
    hf_status st = HF_OK;
    for (size_t i = 0; st == HF_OK && i < vn->n; i++) {
        size_t m2 = push(c, "[%zu]", i);
        st = varied(c, vn->kids[i], v->dim, &v->values[i]);
        pop(c, m2);
    }
    *count = (double)vn->n;
    return st;
}

static hf_status load_vary(ctx *c, const node *n, hf_vary *v, hf_param *p, double *count)
{
    hf_status st = map_check(c, n, "a varied parameter", vary_keys, "key");
    if (st == HF_OK)
        st = param_path(c, n, v, p);
    if (st != HF_OK)
        return st;
    const node *rn = get(n, "range"), *vn = get(n, "values");
    if ((rn != NULL) == (vn != NULL))
        return fail(c, n, "expected either range: [from, to, step] or values: [...], got %s",
                    rn ? "both" : "neither");
    size_t mark = pushkey(c, rn ? "range" : "values");
    if (rn)
        st = range3(c, rn, v->dim, &v->from, &v->to, &v->step, count);
    else
        st = vary_values(c, vn, v, count);
    pop(c, mark);
    return st;
}

static hf_status name_list(ctx *c, const node *n, const char *what, char ***out, size_t *count)
{
    char gotbuf[96];
    if (n->type != N_SEQ || n->n == 0)
        return fail(c, n, "expected a non-empty list of %s, got %s", what,
                    n->type == N_SEQ ? "an empty list" : GOT(n));
    *out = hf_calloc(n->n, sizeof **out);
    if (!*out)
        return nomem(c);
    *count = n->n;
    for (size_t i = 0; i < n->n; i++) {
        size_t mark = push(c, "[%zu]", i);
        hf_status st = name_dup(c, n->kids[i], what, &(*out)[i]);
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    return HF_OK;
}

/* lines and stiffness studies: an optional offset [x, y, heading]. */
static hf_status study_offset(ctx *c, const node *n, hf_study *s)
{
    static const hf_dim off3[3] = {HF_DIM_LENGTH, HF_DIM_LENGTH, HF_DIM_ANGLE};
    if (!get(n, "offset"))
        return HF_OK;
    size_t mark = pushkey(c, "offset");
    hf_status st = vector(c, get(n, "offset"), 3, off3, "an offset [x, y, heading]", s->offset);
    pop(c, mark);
    return st;
}

static hf_status study_curve(ctx *c, const node *n, hf_study *s)
{
    hf_status st = req_quantity(c, n, "direction", HF_DIM_ANGLE, ANY, &s->direction);
    if (st != HF_OK)
        return st;
    if (!get(n, "range"))
        return missing(c, n, "range", "a range of offsets [from, to, step]");
    size_t mark = pushkey(c, "range");
    st = range3(c, get(n, "range"), HF_DIM_LENGTH, &s->from, &s->to, &s->step, NULL);
    pop(c, mark);
    return st;
}

static hf_status study_balance(ctx *c, const node *n, hf_study *s)
{
    char gotbuf[96];
    hf_model *m = c->m;
    const node *ln = get(n, "loads");
    if (m->nloads == 0)
        return fail(c, ln ? ln : n,
                    "expected load cases in a loads: section for a balance "
                    "study, got none");
    if (!ln)
        return HF_OK;
    size_t mark = pushkey(c, "loads");
    hf_status st = name_list(c, ln, "load names", &s->loads, &s->nloads);
    for (size_t i = 0; st == HF_OK && i < s->nloads; i++)
        if (hf_model_load_find(m, s->loads[i]) == (size_t)-1) {
            hf_hint h = {NULL, 0};
            char hb[96];
            for (size_t j = 0; j < m->nloads; j++)
                hf_hint_try(&h, s->loads[i], m->loads[j].name);
            size_t m2 = push(c, "[%zu]", i);
            st = fail(c, ln->kids[i], "expected the name of a load case, got %s%s",
                      GOT(ln->kids[i]), hf_hint_text(&h, hb, sizeof hb));
            pop(c, m2);
        }
    pop(c, mark);
    return st;
}

/* Refuses a parameter varied twice (the same value through two spellings,
 * or two paths that move the same thing: hf_model_param_same). */
static hf_status vary_unique(ctx *c, const node *vn, const hf_vary *v, const hf_param *p, size_t i)
{
    for (size_t j = 0; j < i; j++)
        if (hf_model_param_same(&p[j], &p[i])) {
            size_t m2 = push(c, "[%zu].path", i);
            hf_status st = fail(c, get(vn->kids[i], "path"),
                                "expected each parameter varied once, got \"%s\", which sets the "
                                "same value as \"%s\" (vary[%zu])",
                                v[i].path, v[j].path, j);
            pop(c, m2);
            return st;
        }
    return HF_OK;
}

static hf_status sweep_vary(ctx *c, const node *vn, hf_study *s, double counts[2])
{
    char gotbuf[96];
    if (vn->type != N_SEQ || vn->n == 0)
        return fail(c, vn, "expected a non-empty list of {path, range | values}, got %s",
                    vn->type == N_SEQ ? "an empty list" : GOT(vn));
    if (vn->n > HF_STUDY_MAX_VARY)
        return fail_limit(c, vn,
                          "expected at most %d varied parameters (HF_STUDY_MAX_VARY), "
                          "got %zu",
                          HF_STUDY_MAX_VARY, vn->n);
    s->vary = hf_calloc(vn->n, sizeof *s->vary);
    if (!s->vary)
        return nomem(c);
    s->nvary = vn->n;
    hf_param p[HF_STUDY_MAX_VARY];
    hf_status st = HF_OK;
    for (size_t i = 0; st == HF_OK && i < vn->n; i++) {
        size_t m2 = push(c, "[%zu]", i);
        double k = 0;
        st = load_vary(c, vn->kids[i], &s->vary[i], &p[i], &k);
        if (i == 0)
            counts[0] = k;
        else if (k != counts[0] && counts[1] == 0)
            counts[1] = k;
        pop(c, m2);
        if (st == HF_OK)
            st = vary_unique(c, vn, s->vary, p, i);
    }
    return st;
}

/* A sweep study's outputs, each checked against the output catalogue. */
static hf_status sweep_outputs(ctx *c, const node *on, hf_study *s)
{
    char gotbuf[96];
    if (on->type != N_SEQ || on->n == 0)
        return fail(c, on, "expected a non-empty list of output names, got %s",
                    on->type == N_SEQ ? "an empty list" : GOT(on));
    if (!(s->outputs = hf_calloc(on->n, sizeof *s->outputs)))
        return nomem(c);
    s->noutputs = on->n;
    hf_status st = HF_OK;
    for (size_t i = 0; st == HF_OK && i < on->n; i++) {
        size_t m2 = push(c, "[%zu]", i);
        const char *t;
        hf_output o;
        hf_error sub;
        hf_error_clear(&sub);
        st = text(c, on->kids[i], "an output name", &t);
        if (st == HF_OK && hf_output_parse(c->m, t, &o, &sub) != HF_OK)
            st = fail(c, on->kids[i], "%s", sub.text);
        if (st == HF_OK && !(s->outputs[i] = hf_strdup(t)))
            st = nomem(c);
        pop(c, m2);
    }
    return st;
}

static hf_status study_sweep(ctx *c, const node *n, hf_study *s)
{
    const node *vn = get(n, "vary");
    if (!vn)
        return missing(c, n, "vary", "a list of varied parameters");
    double counts[2] = {0, 0};
    size_t mark = pushkey(c, "vary");
    hf_status st = sweep_vary(c, vn, s, counts);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    const node *cn = get(n, "combine");
    if (cn) {
        static const char *const combine[] = {"grid", "zip"};
        size_t k;
        mark = pushkey(c, "combine");
        st = choose(c, cn, "a way to combine the parameters", combine, 2, &k);
        s->zip = (int)k;
        if (st == HF_OK && s->zip && counts[1] != 0)
            st = fail(c, cn, "expected lists of equal length for zip, got %.0f and %.0f values",
                      counts[0], counts[1]);
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    const node *on = get(n, "outputs");
    if (!on)
        return HF_OK;
    mark = pushkey(c, "outputs");
    st = sweep_outputs(c, on, s);
    pop(c, mark);
    return st;
}

/* An invert study's vary: {path, range: [lo, hi]}. */
static hf_status invert_vary(ctx *c, const node *vn, hf_vary *v)
{
    hf_param p;
    hf_status st = map_check(c, vn, "the varied parameter", invert_vary_keys, "key");
    if (st == HF_OK)
        st = param_path(c, vn, v, &p);
    if (st == HF_OK && !get(vn, "range"))
        st = missing(c, vn, "range", "a bracket [lo, hi]");
    if (st != HF_OK)
        return st;
    const node *rn = get(vn, "range");
    double r[2];
    size_t m2 = pushkey(c, "range");
    st = varied_list(c, rn, 2, v->dim, "a bracket [lo, hi]", r);
    if (st == HF_OK && !(r[0] < r[1]))
        st = fail(c, rn, "expected a bracket [lo, hi] with lo < hi, got [%s, %s]",
                  rn->kids[0]->text, rn->kids[1]->text);
    v->from = r[0];
    v->to = r[1];
    pop(c, m2);
    return st;
}

/* The target's line: name of a line of the case. */
static hf_status target_line(ctx *c, const node *ln, const char **lt)
{
    char gotbuf[96];
    hf_model *m = c->m;
    size_t m2 = pushkey(c, "line");
    hf_status st = name_check(c, ln, "a line name");
    *lt = ln->text;
    if (st == HF_OK && hf_model_line_find(m, *lt) == (size_t)-1) {
        hf_hint h = {NULL, 0};
        char hb[96];
        for (size_t j = 0; j < m->nlines; j++)
            hf_hint_try(&h, *lt, m->lines[j].name);
        st = fail(c, ln, "expected the name of a line, got %s%s", GOT(ln),
                  hf_hint_text(&h, hb, sizeof hb));
    }
    pop(c, m2);
    return st;
}

/* The target's output (with its line): one number of the output catalogue. */
static hf_status target_output(ctx *c, const node *on, const char *ot, const char *lt, hf_output *o)
{
    char gotbuf[96], full[2 * HF_MODEL_MAX_NAME + 8];
    hf_status st = HF_OK;
    hf_error sub;
    hf_error_clear(&sub);
    if (strlen(ot) > HF_MODEL_MAX_NAME)
        st = fail(c, on, "expected an output name, got %s", GOT(on));
    snprintf(full, sizeof full, "%s%s%s", ot, lt ? ":" : "", lt ? lt : "");
    size_t m2 = pushkey(c, "output");
    if (st == HF_OK && hf_output_parse(c->m, full, o, &sub) != HF_OK)
        st = fail(c, on, "%s", sub.text);
    if (st == HF_OK && !hf_output_is_scalar(o))
        st = fail(c, on,
                  "expected an output that is one number (give line: for a per-line output), "
                  "got \"%s\"",
                  full);
    pop(c, m2);
    return st;
}

static hf_status invert_target(ctx *c, const node *tn, hf_study *s)
{
    hf_status st = map_check(c, tn, "the target", target_keys, "key");
    const node *on = st == HF_OK ? get(tn, "output") : NULL;
    if (st == HF_OK && !on)
        st = missing(c, tn, "output", "an output name");
    const node *ln = st == HF_OK ? get(tn, "line") : NULL;
    const char *ot = NULL, *lt = NULL;
    if (st == HF_OK) {
        size_t m2 = pushkey(c, "output");
        st = text(c, on, "an output name", &ot);
        pop(c, m2);
    }
    if (st == HF_OK && ln)
        st = target_line(c, ln, &lt);
    hf_output o;
    if (st == HF_OK)
        st = target_output(c, on, ot, lt, &o);
    if (st == HF_OK && !(s->target_output = hf_strdup(ot)))
        st = nomem(c);
    if (st == HF_OK && lt && !(s->target_line = hf_strdup(lt)))
        st = nomem(c);
    if (st == HF_OK)
        st = req_quantity(c, tn, "value", hf_output_dim(&o), ANY, &s->target_value);
    return st;
}

static hf_status study_invert(ctx *c, const node *n, hf_study *s)
{
    const node *vn = get(n, "vary"), *tn = get(n, "target");
    if (!vn)
        return missing(c, n, "vary", "the varied parameter {path, range: [lo, hi]}");
    s->vary = hf_calloc(1, sizeof *s->vary);
    if (!s->vary)
        return nomem(c);
    s->nvary = 1;
    size_t mark = pushkey(c, "vary");
    hf_status st = invert_vary(c, vn, s->vary);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    if (!tn)
        return missing(c, n, "target", "a target {output, line, value}");
    mark = pushkey(c, "target");
    st = invert_target(c, tn, s);
    pop(c, mark);
    return st;
}

/* One loader per study kind, indexed by hf_study_kind. */
typedef hf_status (*study_loader)(ctx *, const node *, hf_study *);
static const study_loader study_body[] = {study_offset,     study_curve, study_offset,
                                          study_balance,    study_sweep, study_invert,
                                          hf_case_env_study};
_Static_assert(sizeof study_body / sizeof study_body[0] == HF_STUDY_DESIGN + 1,
               "one loader per hf_study_kind");

static hf_status load_study(ctx *c, const node *n, size_t index)
{
    char gotbuf[96];
    hf_study *s = &c->studies->v[index];
    if (!n || n->type != N_MAP)
        return fail(c, n, "expected a study (a mapping with name and kind), got %s", GOT(n));
    const node *kn = get(n, "kind");
    if (!kn)
        return missing(c, n, "kind",
                       "a study kind (lines, curve, stiffness, balance, sweep, "
                       "invert, design)");
    size_t k, mark = pushkey(c, "kind");
    hf_status st = choose(c, kn, "a study kind", kind_names, 7, &k);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    s->kind = (hf_study_kind)k;
    st = map_check(c, n, study_what[k], study_keys[k], "key");
    if (st != HF_OK)
        return st;
    const node *nn = get(n, "name");
    if (!nn)
        return missing(c, n, "name", "a study name");
    mark = pushkey(c, "name");
    st = name_dup(c, nn, "a study name", &s->name);
    for (size_t j = 0; st == HF_OK && j < index; j++)
        if (!strcmp(c->studies->v[j].name, s->name))
            st = fail(c, nn, "expected a unique study name, got \"%s\" again", s->name);
    pop(c, mark);
    if (st != HF_OK)
        return st;
    return study_body[k](c, n, s);
}

static hf_status load_studies(ctx *c, const node *n)
{
    char gotbuf[96];
    if (!n || n->type != N_SEQ)
        return fail(c, n, "expected a list of studies, got %s", GOT(n));
    if (n->n == 0)
        return HF_OK;
    c->studies->v = hf_calloc(n->n, sizeof *c->studies->v);
    if (!c->studies->v)
        return nomem(c);
    c->studies->n = n->n;
    for (size_t i = 0; i < n->n; i++) {
        size_t mark = push(c, "[%zu]", i);
        hf_status st = load_study(c, n->kids[i], i);
        pop(c, mark);
        if (st != HF_OK)
            return st;
    }
    return HF_OK;
}

/* ---- top level ---- */

static const char *const top_keys[] = {"title", "site",     "components", "lines",        "hull",
                                       "loads", "criteria", "studies",    "environments", NULL};

static hf_status section(ctx *c, const node *root, const char *key,
                         hf_status (*fn)(ctx *, const node *))
{
    const node *v = get(root, key);
    if (!v)
        return HF_OK;
    size_t mark = pushkey(c, key);
    hf_status st = fn(c, v);
    pop(c, mark);
    return st;
}

static hf_status load_title(ctx *c, const node *n)
{
    const char *t;
    hf_status st = text(c, n, "a title (text)", &t);
    if (st != HF_OK)
        return st;
    c->m->title = hf_strdup(t);
    return c->m->title ? HF_OK : nomem(c);
}

static hf_status load_root(ctx *c, const node *root)
{
    if (!root || is_null(root))
        return fail(c, root,
                    "expected a case (a mapping with site, components and lines), got "
                    "an empty file");
    hf_status st = map_check(c, root, "a case file", top_keys, "top-level key");
    if (st != HF_OK)
        return st;
    if (!get(root, "site"))
        return missing(c, root, "site", "a site with its depth");
    if (!get(root, "components"))
        return missing(c, root, "components", "a component catalogue");
    if (!get(root, "lines"))
        return missing(c, root, "lines", "a list of lines");
    /* Dependency order, whatever the order in the file. */
    if ((st = section(c, root, "title", load_title)) != HF_OK ||
        (st = section(c, root, "site", load_site)) != HF_OK ||
        (st = section(c, root, "components", load_components)) != HF_OK ||
        (st = section(c, root, "hull", load_hull)) != HF_OK ||
        (st = section(c, root, "lines", load_lines)) != HF_OK ||
        (st = section(c, root, "loads", load_loads)) != HF_OK ||
        (st = section(c, root, "criteria", load_criteria)) != HF_OK ||
        (st = section(c, root, "environments", hf_case_env_list)) != HF_OK || /* case_env.c */
        (st = section(c, root, "studies", load_studies)) != HF_OK)
        return st;
    if (!get(root, "criteria"))
        c->m->criteria.source = "no criteria given";
    hf_error sub;
    hf_error_clear(&sub);
    st = hf_model_resolve(c->m, &sub);
    if (st != HF_OK)
        return hf_error_set(c->err, st, "%s:%d:%d: %s", c->file, root->line, root->col, sub.text);
    return HF_OK;
}

/* ---- anchors and aliases ---- */

/* Most nodes that aliases may add in one file: a guard against documents
 * that expand exponentially ("billion laughs"). */
#define MAX_ALIAS_NODES 500000

typedef struct {
    char *name;
    node *n;
} anchor_ent;

typedef struct {
    anchor_ent *v;
    size_t n, cap;
    size_t copied; /* nodes created by aliases so far */
} anchors;

static void anchors_free(anchors *a)
{
    for (size_t i = 0; i < a->n; i++)
        hf_free(a->v[i].name);
    hf_free(a->v);
}

static int anchors_add(anchors *a, const char *name, node *n)
{
    if (a->n == a->cap) {
        size_t cap = a->cap ? 2 * a->cap : 8;
        anchor_ent *v = hf_realloc(a->v, cap * sizeof *v);
        if (!v)
            return 0;
        a->v = v;
        a->cap = cap;
    }
    char *dup = hf_strdup(name);
    if (!dup)
        return 0;
    a->v[a->n].name = dup;
    a->v[a->n++].n = n;
    return 1;
}

/* Nodes in the subtree and its height (a scalar has height 0). */
static size_t subtree(const node *n, int *height)
{
    size_t count = 1;
    int h = 0;
    for (size_t i = 0; i < n->n; i++) {
        int kh;
        count += subtree(n->kids[i], &kh);
        if (kh + 1 > h)
            h = kh + 1;
    }
    *height = n->type == N_SCALAR ? 0 : h + 1;
    return count;
}

/* Deep copy; NULL when an allocation fails. */
static node *node_copy(const node *n)
{
    node *d = hf_calloc(1, sizeof *d);
    if (!d)
        return NULL;
    d->type = n->type;
    d->line = n->line;
    d->col = n->col;
    d->plain = n->plain;
    if (n->text && !(d->text = hf_strdup(n->text))) {
        hf_free(d);
        return NULL;
    }
    for (size_t i = 0; i < n->n; i++) {
        node *k = node_copy(n->kids[i]);
        if (!k || !node_add(d, k)) {
            node_free(k);
            node_free(d);
            return NULL;
        }
    }
    return d;
}

/* ---- the node tree from libyaml events: one handler per event ---- */

typedef struct {
    ctx *c;
    node *stack[HF_CASE_MAX_DEPTH + 1]; /* open sequences and mappings */
    int depth, docs;
    size_t nodes; /* every value built so far, alias copies included */
    anchors al;
    node **root;
} builder;

static hf_status syntax_error(ctx *c, const yaml_parser_t *parser)
{
    const yaml_mark_t *mk = &parser->problem_mark;
    if (parser->error == YAML_MEMORY_ERROR)
        return nomem(c);
    if (parser->context)
        return hf_error_set(c->err, HF_EINVAL, "%s:%zu:%zu: YAML syntax: %s (%s at %zu:%zu)",
                            c->file, mk->line + 1, mk->column + 1,
                            parser->problem ? parser->problem : "invalid YAML", parser->context,
                            parser->context_mark.line + 1, parser->context_mark.column + 1);
    return hf_error_set(c->err, HF_EINVAL, "%s:%zu:%zu: YAML syntax: %s", c->file, mk->line + 1,
                        mk->column + 1, parser->problem ? parser->problem : "invalid YAML");
}

/* Hangs a finished node under the open collection (or makes it the root). */
static hf_status attach(builder *b, node *nn)
{
    if (b->depth == 0) {
        node_free(*b->root); /* only an alias at the top can replace a root */
        *b->root = nn;
        return HF_OK;
    }
    if (!node_add(b->stack[b->depth - 1], nn)) {
        node_free(nn);
        return nomem(b->c);
    }
    return HF_OK;
}

static hf_status on_document(builder *b, const node *at)
{
    if (++b->docs > 1)
        return fail(b->c, at, "expected one YAML document in a case file, got a second one");
    return HF_OK;
}

/* The node an alias names (the latest definition), checked to be finished. */
static hf_status alias_target(builder *b, const node *at, const char *name, node **target)
{
    *target = NULL;
    for (size_t i = b->al.n; i-- > 0;)
        if (!strcmp(b->al.v[i].name, name)) {
            *target = b->al.v[i].n;
            break;
        }
    if (!*target)
        return fail(b->c, at, "expected an alias to an anchor defined above (&%s), got *%s", name,
                    name);
    for (int i = 0; i < b->depth; i++)
        if (b->stack[i] == *target)
            return fail(b->c, at,
                        "expected an alias to a finished value, got *%s inside the "
                        "value it names",
                        name);
    return HF_OK;
}

/* An alias stands for a copy of the node its anchor names; messages about
 * the copy point at the anchored text.  The copies count against the
 * nesting, node and alias-expansion limits. */
static hf_status on_alias(builder *b, const yaml_event_t *ev, const node *at)
{
    const char *name = (const char *)ev->data.alias.anchor;
    node *target;
    hf_status st = alias_target(b, at, name, &target);
    if (st != HF_OK)
        return st;
    int height;
    size_t count = subtree(target, &height);
    if (b->depth + height > HF_CASE_MAX_DEPTH)
        return fail_limit(b->c, at,
                          "expected at most %d nested levels (HF_CASE_MAX_DEPTH), got "
                          "deeper nesting through *%s",
                          HF_CASE_MAX_DEPTH, name);
    b->al.copied += count;
    b->nodes += count;
    if (b->nodes > HF_CASE_MAX_NODES)
        return fail_limit(b->c, at,
                          "expected at most %d values in a case file "
                          "(HF_CASE_MAX_NODES), got more at *%s",
                          HF_CASE_MAX_NODES, name);
    if (b->al.copied > MAX_ALIAS_NODES)
        return fail_limit(b->c, at,
                          "expected aliases to expand to at most %d values, got more "
                          "at *%s",
                          MAX_ALIAS_NODES, name);
    node *nn = node_copy(target);
    return nn ? attach(b, nn) : nomem(b->c);
}

/* The limits a new value must respect before it is built. */
static hf_status value_limits(builder *b, const yaml_event_t *ev, const node *at)
{
    if (ev->type != YAML_SCALAR_EVENT && b->depth >= HF_CASE_MAX_DEPTH)
        return fail_limit(b->c, at,
                          "expected at most %d nested levels (HF_CASE_MAX_DEPTH), got "
                          "deeper nesting",
                          HF_CASE_MAX_DEPTH);
    if (ev->type == YAML_SCALAR_EVENT) {
        size_t n = ev->data.scalar.length;
        if (n > HF_CASE_MAX_SCALAR)
            return fail_limit(b->c, at,
                              "expected a value of at most %d bytes "
                              "(HF_CASE_MAX_SCALAR), got %zu bytes",
                              HF_CASE_MAX_SCALAR, n);
        if (memchr(ev->data.scalar.value, '\0', n))
            return fail(b->c, at, "expected text, got a value containing a NUL byte");
    }
    if (++b->nodes > HF_CASE_MAX_NODES)
        return fail_limit(b->c, at,
                          "expected at most %d values in a case file "
                          "(HF_CASE_MAX_NODES), got more",
                          HF_CASE_MAX_NODES);
    return HF_OK;
}

/* A scalar, or the start of a sequence or mapping: a new node, attached,
 * remembered under its anchor, and opened when it is a collection. */
static hf_status on_value(builder *b, const yaml_event_t *ev, const node *at)
{
    hf_status st = value_limits(b, ev, at);
    if (st != HF_OK)
        return st;
    node *nn = hf_calloc(1, sizeof *nn);
    if (!nn)
        return nomem(b->c);
    nn->line = at->line;
    nn->col = at->col;
    const yaml_char_t *anchor;
    if (ev->type == YAML_SCALAR_EVENT) {
        nn->type = N_SCALAR;
        nn->plain = ev->data.scalar.style == YAML_PLAIN_SCALAR_STYLE;
        nn->text = hf_strndup((const char *)ev->data.scalar.value, ev->data.scalar.length);
        if (!nn->text) {
            hf_free(nn);
            return nomem(b->c);
        }
        anchor = ev->data.scalar.anchor;
    } else if (ev->type == YAML_SEQUENCE_START_EVENT) {
        nn->type = N_SEQ;
        anchor = ev->data.sequence_start.anchor;
    } else {
        nn->type = N_MAP;
        anchor = ev->data.mapping_start.anchor;
    }
    if ((st = attach(b, nn)) != HF_OK)
        return st;
    if (anchor && !anchors_add(&b->al, (const char *)anchor, nn))
        return nomem(b->c);
    if (nn->type != N_SCALAR)
        b->stack[b->depth++] = nn;
    return HF_OK;
}

static hf_status on_event(builder *b, const yaml_event_t *ev)
{
    node at = {.line = (int)ev->start_mark.line + 1, .col = (int)ev->start_mark.column + 1};
    switch (ev->type) {
    case YAML_DOCUMENT_START_EVENT:
        return on_document(b, &at);
    case YAML_ALIAS_EVENT:
        return on_alias(b, ev, &at);
    case YAML_SCALAR_EVENT:
    case YAML_SEQUENCE_START_EVENT:
    case YAML_MAPPING_START_EVENT:
        return on_value(b, ev, &at);
    case YAML_SEQUENCE_END_EVENT:
    case YAML_MAPPING_END_EVENT:
        if (b->depth > 0)
            b->depth--;
        return HF_OK;
    default:
        return HF_OK;
    }
}

/* Builds the node tree from libyaml events.  *root is NULL for an empty stream. */
static hf_status parse_tree(ctx *c, const char *textbuf, size_t len, node **root)
{
    yaml_parser_t parser;
    yaml_event_t ev;
    builder b;
    memset(&b, 0, sizeof b);
    b.c = c;
    b.root = root;
    *root = NULL;
    if (!yaml_parser_initialize(&parser))
        return nomem(c);
    yaml_parser_set_input_string(&parser, (const unsigned char *)textbuf, len);
    hf_status st = HF_OK;
    for (;;) {
        if (!yaml_parser_parse(&parser, &ev)) {
            st = syntax_error(c, &parser);
            break;
        }
        yaml_event_type_t type = ev.type;
        st = on_event(&b, &ev);
        yaml_event_delete(&ev);
        if (st != HF_OK || type == YAML_STREAM_END_EVENT)
            break;
    }
    yaml_parser_delete(&parser);
    anchors_free(&b.al);
    if (st != HF_OK) {
        node_free(*root);
        *root = NULL;
    }
    return st;
}

hf_status hf_case_load_buffer_with_studies(const char *textbuf, size_t len, const char *name,
                                           hf_model *m, hf_study_list *studies, hf_error *err)
{
    hf_study_list own;
    hf_study_list_init(&own);
    ctx c = {
        .file = name ? name : "<case>", .m = m, .studies = studies ? studies : &own, .err = err};
    c.path[0] = '\0';
    hf_model_free(m);
    hf_study_list_free(studies);
    if (len > HF_CASE_MAX_BYTES)
        return hf_error_set(err, HF_ELIMIT,
                            "%s: expected a case file of at most %u bytes (HF_CASE_MAX_BYTES), "
                            "got %zu bytes",
                            c.file, (unsigned)HF_CASE_MAX_BYTES, len);
    node *root = NULL;
    hf_status st = parse_tree(&c, textbuf, len, &root);
    if (st == HF_OK) {
        m->source_path = hf_strdup(c.file);
        st = m->source_path ? load_root(&c, root) : nomem(&c);
    }
    node_free(root);
    hf_study_list_free(&own);
    if (st != HF_OK) {
        hf_model_free(m);
        hf_study_list_free(studies);
    }
    return st;
}

hf_status hf_case_load_buffer(const char *textbuf, size_t len, const char *name, hf_model *m,
                              hf_error *err)
{
    return hf_case_load_buffer_with_studies(textbuf, len, name, m, NULL, err);
}

hf_status hf_case_load(const char *path, hf_model *m, hf_error *err)
{
    return hf_case_load_with_studies(path, m, NULL, err);
}

hf_status hf_case_load_with_studies(const char *path, hf_model *m, hf_study_list *studies,
                                    hf_error *err)
{
    hf_model_free(m);
    hf_study_list_free(studies);
    if (!path)
        return hf_error_set(err, HF_EINVAL, "no case file given");
    FILE *f = fopen(path, "rb");
    if (!f)
        return hf_error_set(err, HF_EIO, "%s: cannot open the case file: %s", path,
                            strerror(errno));
    /* Read at most HF_CASE_MAX_BYTES + 1 bytes: one more than the limit
     * tells that the file is too large without reading all of it. */
    const size_t most = (size_t)HF_CASE_MAX_BYTES + 1;
    size_t cap = 1 << 16, len = 0;
    char *buf = hf_malloc(cap);
    hf_status st = HF_OK;
    if (!buf)
        st = hf_error_set(err, HF_ENOMEM, "%s: out of memory while reading", path);
    while (st == HF_OK && len < most) {
        if (len == cap) {
            size_t grow = cap * 2 < most ? cap * 2 : most;
            char *nb = hf_realloc(buf, grow);
            if (!nb) {
                st = hf_error_set(err, HF_ENOMEM, "%s: out of memory while reading", path);
                break;
            }
            buf = nb;
            cap = grow;
        }
        size_t got_n = fread(buf + len, 1, cap - len, f);
        len += got_n;
        if (got_n == 0) {
            if (ferror(f))
                st = hf_error_set(err, HF_EIO, "%s: cannot read the case file: %s", path,
                                  strerror(errno));
            break;
        }
    }
    if (st == HF_OK && len >= most)
        st = hf_error_set(err, HF_ELIMIT,
                          "%s: expected a case file of at most %u bytes (HF_CASE_MAX_BYTES), "
                          "got more",
                          path, (unsigned)HF_CASE_MAX_BYTES);
    fclose(f);
    if (st == HF_OK)
        st = hf_case_load_buffer_with_studies(buf, len, path, m, studies, err);
    hf_free(buf);
    return st;
}

/* ---- the checks above, for case_env.c (case_tree.h) ---- */

size_t hf_case_tree_pushkey(ctx *c, const char *key)
{
    return pushkey(c, key);
}

size_t hf_case_tree_pushindex(ctx *c, size_t i)
{
    return push(c, "[%zu]", i);
}

void hf_case_tree_pop(ctx *c, size_t mark)
{
    pop(c, mark);
}

hf_status hf_case_tree_fail(ctx *c, const node *n, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    hf_status s = failv(c, HF_EINVAL, n, fmt, ap);
    va_end(ap);
    return s;
}

hf_status hf_case_tree_nomem(ctx *c)
{
    return nomem(c);
}

const char *hf_case_tree_got(const node *n, char *buf, size_t cap)
{
    return got(n, buf, cap);
}

int hf_case_tree_is_null(const node *n)
{
    return is_null(n);
}

hf_status hf_case_tree_map_check(ctx *c, const node *n, const char *what, const char *const *keys)
{
    return map_check(c, n, what, keys, "key");
}

const node *hf_case_tree_get(const node *map, const char *key)
{
    return get(map, key);
}

const node *hf_case_tree_getkey(const node *map, const char *key)
{
    return getkey(map, key);
}

hf_status hf_case_tree_missing(ctx *c, const node *map, const char *key, const char *what)
{
    return missing(c, map, key, what);
}

hf_status hf_case_tree_quantity(ctx *c, const node *n, hf_dim dim, int range, double *out)
{
    return quantity_in(c, n, dim, range, out);
}

hf_status hf_case_tree_opt_quantity(ctx *c, const node *map, const char *key, hf_dim dim, int range,
                                    double *out)
{
    return opt_quantity(c, map, key, dim, range, out);
}

hf_status hf_case_tree_text(ctx *c, const node *n, const char *what, const char **out)
{
    return text(c, n, what, out);
}

hf_status hf_case_tree_name_dup(ctx *c, const node *n, const char *what, char **out)
{
    return name_dup(c, n, what, out);
}
