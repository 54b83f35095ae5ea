/* outputs.c - the output catalogue: one table of every study output (name,
 * per line or not, dimension, column, unit, scale, meaning) and the
 * functions that read it. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/hint.h"
#include "holdfast/outputs.h"

#define NONE ((size_t)-1)

/* The catalogue.  Scales: N -> kN (1e-3), N/m -> kN/m (1e-3),
 * N m/rad -> kN m/rad (1e-3). */
static const hf_output_info catalogue[HF_OUT_COUNT] = {
    {HF_OUT_FAIRLEAD_TENSION, "fairlead_tension", 1, "T_", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "line tension at the fairlead", 0},
    {HF_OUT_FAIRLEAD_HORIZONTAL, "fairlead_horizontal", 1, "H_", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "horizontal line force at the fairlead", 0},
    {HF_OUT_FAIRLEAD_VERTICAL, "fairlead_vertical", 1, "V_", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "vertical line force at the fairlead", 0},
    {HF_OUT_ANCHOR_TENSION, "anchor_tension", 1, "anchor_T_", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "line tension at the anchor", 0},
    {HF_OUT_UTILISATION, "utilisation", 1, "U_", HF_DIM_NONE, "", "-", 1.0,
     "tension / MBL of the line's most loaded section", 0},
    {HF_OUT_MAX_TENSION, "max_tension", 0, "max_tension", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "largest fairlead tension and its line (max_tension_line)", 0},
    {HF_OUT_MAX_UTILISATION, "max_utilisation", 0, "max_utilisation", HF_DIM_NONE, "", "-", 1.0,
     "largest utilisation and its line (worst_line)", 0},
    {HF_OUT_STIFFNESS_SURGE, "stiffness_surge", 0, "stiffness_surge", HF_DIM_FORCE_PER_LENGTH,
     "kN_per_m", "kN/m", 1e-3, "mooring stiffness K11 (surge) at rest", 0},
    {HF_OUT_STIFFNESS_SWAY, "stiffness_sway", 0, "stiffness_sway", HF_DIM_FORCE_PER_LENGTH,
     "kN_per_m", "kN/m", 1e-3, "mooring stiffness K22 (sway) at rest", 0},
    {HF_OUT_STIFFNESS_HEAVE, "stiffness_heave", 0, "stiffness_heave", HF_DIM_FORCE_PER_LENGTH,
     "kN_per_m", "kN/m", 1e-3, "mooring stiffness K33 (heave) at rest", 0},
    {HF_OUT_STIFFNESS_YAW, "stiffness_yaw", 0, "stiffness_yaw", HF_DIM_MOMENT, "kNm_per_rad",
     "kN m/rad", 1e-3, "mooring stiffness K66 (yaw) at rest", 0},
    {HF_OUT_VERTICAL_LOAD, "vertical_load", 0, "vertical_load", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "downward mooring load on the hull at rest", 0},
    {HF_OUT_OFFSET, "offset_", 0, "offset_", HF_DIM_LENGTH, "m", "m", 1.0,
     "intact mean offset under a load case: surge, sway (m), yaw (deg)", 0},
    /* At the intact mean equilibrium under a load case (balance.h); the
     * tensions are the largest along each line, as in the balance CSV. */
    {HF_OUT_TENSION_AT, "tension", 1, "Tmax_", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "largest tension along the line, intact equilibrium under <load>", 1},
    {HF_OUT_UTILISATION_AT, "utilisation", 1, "U_", HF_DIM_NONE, "", "-", 1.0,
     "T/MBL of the most loaded section, intact equilibrium under <load>", 1},
    {HF_OUT_MAX_TENSION_AT, "max_tension", 0, "max_tension", HF_DIM_FORCE, "kN", "kN", 1e-3,
     "largest tension and its line, intact equilibrium under <load>", 1},
    {HF_OUT_MAX_UTILISATION_AT, "max_utilisation", 0, "max_utilisation", HF_DIM_NONE, "", "-", 1.0,
     "largest utilisation and its line, intact equilibrium under <load>", 1},
    {HF_OUT_OFFSET_AT, "offset", 0, "offset", HF_DIM_LENGTH, "m", "m", 1.0,
     "horizontal offset (from rest) of the intact equilibrium under <load>", 1},
};

static const char *const default_outputs[] = {"fairlead_tension", "utilisation", "max_utilisation",
                                              "stiffness_surge"};

const hf_output_info *hf_output_info_of(hf_output_kind k)
{
    return (unsigned)k < HF_OUT_COUNT ? &catalogue[k] : NULL;
}

const char *hf_output_name(hf_output_kind k)
{
    return (unsigned)k < HF_OUT_COUNT ? catalogue[k].name : "?";
}

const char *const *hf_output_defaults(size_t *n)
{
    *n = sizeof default_outputs / sizeof default_outputs[0];
    return default_outputs;
}

/* The form of output k for people: "fairlead_tension[:LINE]",
 * "offset_<load>", "max_tension@<load>", "utilisation@<load>[:LINE]". */
static void name_form(int k, char *buf, size_t cap)
{
    const hf_output_info *in = &catalogue[k];
    snprintf(buf, cap, "%s%s%s", in->name,
             k == HF_OUT_OFFSET ? "<load>"
             : in->at_load      ? "@<load>"
                                : "",
             in->per_line ? "[:LINE]" : "");
}

/* The list of names for messages ("fairlead_tension[:LINE], ..., offset_<load>"). */
static void names_list(char *buf, size_t cap)
{
    size_t len = 0;
    buf[0] = '\0';
    for (int k = 0; k < HF_OUT_COUNT && len < cap; k++) {
        char form[64];
        name_form(k, form, sizeof form);
        len += (size_t)snprintf(buf + len, cap - len, "%s%s", k ? ", " : "", form);
    }
}

/* The load named text[a..b) of output `text` into out->load; `form` names
 * the output's form for the message ("offset_<load>"). */
static hf_status parse_load(const hf_model *m, const char *text, size_t a, size_t b,
                            const char *form, hf_output *out, hf_error *err)
{
    char name[HF_MODEL_MAX_NAME + 1], hb[HF_MODEL_MAX_NAME + 32];
    if (b - a > HF_MODEL_MAX_NAME)
        return hf_error_set(err, HF_EINVAL, "output \"%s\": load name too long", text);
    memcpy(name, text + a, b - a);
    name[b - a] = '\0';
    size_t li = hf_model_load_find(m, name);
    if (li == NONE) {
        hf_hint h;
        hf_hint_init(&h);
        for (size_t j = 0; j < m->nloads; j++)
            hf_hint_try(&h, name, m->loads[j].name);
        return hf_error_set(err, HF_EINVAL,
                            "output \"%s\": the case has no load named \"%s\" (%s takes a name "
                            "from the loads: list)%s",
                            text, name, form, hf_hint_text(&h, hb, sizeof hb));
    }
    out->load = li;
    return HF_OK;
}

static hf_status parse_offset(const hf_model *m, const char *text, size_t n, hf_output *out,
                              hf_error *err)
{
    out->kind = HF_OUT_OFFSET;
    return parse_load(m, text, 7, n, "offset_<load>", out, err);
}

static hf_status parse_line(const hf_model *m, const char *text, const char *lname, hf_output *out,
                            hf_error *err)
{
    char hb[HF_MODEL_MAX_NAME + 32];
    size_t li = hf_model_line_find(m, lname);
    if (li != NONE) {
        out->line = li;
        return HF_OK;
    }
    hf_hint h;
    hf_hint_init(&h);
    for (size_t j = 0; j < m->nlines; j++)
        hf_hint_try(&h, lname, m->lines[j].name);
    return hf_error_set(err, HF_EINVAL, "output \"%s\": the case has no line named \"%s\"%s", text,
                        lname, hf_hint_text(&h, hb, sizeof hb));
}

/* An unknown name (text[0..n)); at: 1 when it was written NAME@LOAD, so
 * the hint looks among the outputs evaluated under a load. */
static hf_status unknown(const char *text, size_t n, int at, hf_error *err)
{
    char list[1024], word[64], hb[96];
    names_list(list, sizeof list);
    snprintf(word, sizeof word, "%.*s", (int)(n < 63 ? n : 63), text);
    hf_hint h;
    hf_hint_init(&h);
    for (int k = 0; k < HF_OUT_COUNT; k++)
        if (k != HF_OUT_OFFSET && catalogue[k].at_load == at)
            hf_hint_try(&h, word, catalogue[k].name);
    return hf_error_set(err, HF_EINVAL, "unknown output \"%s\"; expected one of %s%s", text, list,
                        hf_hint_text(&h, hb, sizeof hb));
}

/* The entry named text[0..n) among the outputs with at_load == at, or -1. */
static int find_kind(const char *text, size_t n, int at)
{
    for (int k = 0; k < HF_OUT_COUNT; k++) {
        const hf_output_info *in = &catalogue[k];
        if (k != HF_OUT_OFFSET && in->at_load == at && strlen(in->name) == n &&
            !strncmp(in->name, text, n))
            return k;
    }
    return -1;
}

/* "NAME@LOAD" or "NAME@LOAD:LINE": at points at the '@', colon at the ':'
 * or NULL. */
static hf_status parse_at(const hf_model *m, const char *text, const char *at, const char *colon,
                          hf_output *out, hf_error *err)
{
    size_t n = (size_t)(at - text);
    int k = find_kind(text, n, 1);
    if (k < 0)
        return find_kind(text, n, 0) >= 0
                   ? hf_error_set(err, HF_EINVAL,
                                  "output \"%s\": %.*s is evaluated at rest and takes no @LOAD "
                                  "(the outputs under a load are tension, utilisation, "
                                  "max_tension, max_utilisation and offset)",
                                  text, (int)n, text)
                   : unknown(text, n, 1, err);
    out->kind = (hf_output_kind)k;
    size_t end = colon ? (size_t)(colon - text) : strlen(text);
    char form[64];
    name_form(k, form, sizeof form);
    if (end == n + 1)
        return hf_error_set(err, HF_EINVAL, "output \"%s\": expected %s, a load name after '@'",
                            text, form);
    hf_status st = parse_load(m, text, n + 1, end, form, out, err);
    if (st != HF_OK || !colon)
        return st;
    if (!catalogue[k].per_line)
        return hf_error_set(err, HF_EINVAL,
                            "output \"%s\": %s is one value for the spread and takes no :LINE",
                            text, form);
    return parse_line(m, text, colon + 1, out, err);
}

hf_status hf_output_parse(const hf_model *m, const char *text, hf_output *out, hf_error *err)
{
    memset(out, 0, sizeof *out);
    out->line = HF_OUTPUT_ALL;
    out->load = NONE;
    const char *colon = strchr(text, ':');
    const char *at = strchr(text, '@');
    if (at && (!colon || at < colon))
        return parse_at(m, text, at, colon, out, err);
    size_t n = colon ? (size_t)(colon - text) : strlen(text);
    if (n > 7 && !strncmp(text, "offset_", 7) && !colon)
        return parse_offset(m, text, n, out, err);
    int k = find_kind(text, n, 0);
    if (k < 0 && find_kind(text, n, 1) >= 0) {
        char form[64], word[64], list[1024];
        name_form(find_kind(text, n, 1), form, sizeof form);
        snprintf(word, sizeof word, "%.*s", (int)(n < 63 ? n : 63), text);
        names_list(list, sizeof list);
        return hf_error_set(err, HF_EINVAL,
                            "output \"%s\": %s is evaluated under a load case; write %s with "
                            "a name from the loads: list (every output: %s)",
                            text, word, form, list);
    }
    if (k < 0)
        return unknown(text, n, 0, err);
    const hf_output_info *in = &catalogue[k];
    out->kind = (hf_output_kind)k;
    if (!colon)
        return HF_OK;
    if (!in->per_line)
        return hf_error_set(err, HF_EINVAL,
                            "output \"%s\": %s is one value for the spread and takes no "
                            ":LINE",
                            text, in->name);
    return parse_line(m, text, colon + 1, out, err);
}

int hf_output_is_scalar(const hf_output *o)
{
    if ((unsigned)o->kind >= HF_OUT_COUNT)
        return 0;
    if (catalogue[o->kind].per_line)
        return o->line != HF_OUTPUT_ALL;
    return 1;
}

int hf_output_needs_balance(const hf_output *o)
{
    return (unsigned)o->kind < HF_OUT_COUNT &&
           (o->kind == HF_OUT_OFFSET || catalogue[o->kind].at_load);
}

hf_dim hf_output_dim(const hf_output *o)
{
    return (unsigned)o->kind < HF_OUT_COUNT ? catalogue[o->kind].dim : HF_DIM_NONE;
}

void hf_output_text(const hf_model *m, const hf_output *o, char *buf, size_t cap)
{
    const char *name = hf_output_name(o->kind);
    int at = (unsigned)o->kind < HF_OUT_COUNT && catalogue[o->kind].at_load;
    const char *ln = o->load < m->nloads ? m->loads[o->load].name : "?";
    int per_line = (unsigned)o->kind < HF_OUT_COUNT && catalogue[o->kind].per_line;
    if (o->kind == HF_OUT_OFFSET && o->load < m->nloads)
        snprintf(buf, cap, "offset_%s", m->loads[o->load].name);
    else if (at && per_line && o->line < m->nlines)
        snprintf(buf, cap, "%s@%s:%s", name, ln, m->lines[o->line].name);
    else if (at)
        snprintf(buf, cap, "%s@%s", name, ln);
    else if ((unsigned)o->kind < HF_OUT_COUNT && catalogue[o->kind].per_line && o->line < m->nlines)
        snprintf(buf, cap, "%s:%s", name, m->lines[o->line].name);
    else
        snprintf(buf, cap, "%s", name);
}

static size_t put_col(hf_output_column *cols, size_t cap, size_t n, hf_output_column c)
{
    if (n < cap)
        cols[n] = c;
    return n + 1;
}

size_t hf_output_columns(const hf_model *m, const hf_output *o, hf_output_column *cols, size_t cap)
{
    hf_output_column c = {o->kind, 0, o->load, 0};
    size_t n = 0;
    if ((unsigned)o->kind >= HF_OUT_COUNT)
        return 0;
    if (o->kind == HF_OUT_OFFSET) {
        for (c.sub = 0; c.sub < 3; c.sub++)
            n = put_col(cols, cap, n, c);
    } else if (catalogue[o->kind].per_line) {
        size_t lo = o->line == HF_OUTPUT_ALL ? 0 : o->line;
        size_t hi = o->line == HF_OUTPUT_ALL ? m->nlines : o->line + 1;
        for (c.line = lo; c.line < hi; c.line++)
            n = put_col(cols, cap, n, c);
    } else {
        n = put_col(cols, cap, n, c);
        if (o->kind == HF_OUT_MAX_TENSION || o->kind == HF_OUT_MAX_UTILISATION ||
            o->kind == HF_OUT_MAX_TENSION_AT || o->kind == HF_OUT_MAX_UTILISATION_AT) {
            c.sub = 1;
            n = put_col(cols, cap, n, c);
        }
    }
    return n;
}

int hf_output_column_is_line(const hf_output_column *c)
{
    return c->sub == 1 &&
           (c->kind == HF_OUT_MAX_TENSION || c->kind == HF_OUT_MAX_UTILISATION ||
            c->kind == HF_OUT_MAX_TENSION_AT || c->kind == HF_OUT_MAX_UTILISATION_AT);
}

/* Column name of a NAME@LOAD output column: the rest form's name with
 * "@<load>" before the unit ("Tmax_bow@storm_kN", "worst_line@storm"). */
static void at_column_name(const hf_model *m, const hf_output_column *c, char *buf, size_t cap)
{
    const hf_output_info *in = &catalogue[c->kind];
    const char *load = c->load < m->nloads ? m->loads[c->load].name : "?";
    const char *sep = in->unit[0] ? "_" : "";
    if (in->per_line)
        snprintf(buf, cap, "%s%s@%s%s%s", in->column,
                 c->line < m->nlines ? m->lines[c->line].name : "?", load, sep, in->unit);
    else if (hf_output_column_is_line(c))
        snprintf(buf, cap, "%s@%s",
                 c->kind == HF_OUT_MAX_TENSION_AT ? "max_tension_line" : "worst_line", load);
    else
        snprintf(buf, cap, "%s@%s%s%s", in->column, load, sep, in->unit);
}

void hf_output_column_name(const hf_model *m, const hf_output_column *c, char *buf, size_t cap)
{
    static const char *const off_name[] = {"surge_m", "sway_m", "yaw_deg"};
    const hf_output_info *in = hf_output_info_of(c->kind);
    if (!in) {
        snprintf(buf, cap, "?");
        return;
    }
    const char *sep = in->unit[0] ? "_" : "";
    if (in->at_load)
        at_column_name(m, c, buf, cap);
    else if (c->kind == HF_OUT_OFFSET)
        snprintf(buf, cap, "offset_%s_%s", c->load < m->nloads ? m->loads[c->load].name : "?",
                 off_name[c->sub >= 0 && c->sub < 3 ? c->sub : 0]);
    else if (in->per_line)
        snprintf(buf, cap, "%s%s%s%s", in->column,
                 c->line < m->nlines ? m->lines[c->line].name : "?", sep, in->unit);
    else if (hf_output_column_is_line(c))
        snprintf(buf, cap, "%s", c->kind == HF_OUT_MAX_TENSION ? "max_tension_line" : "worst_line");
    else
        snprintf(buf, cap, "%s%s%s", in->column, sep, in->unit);
}

double hf_output_column_scale(const hf_output_column *c)
{
    const hf_output_info *in = hf_output_info_of(c->kind);
    if (!in || hf_output_column_is_line(c))
        return 0.0;
    if (c->kind == HF_OUT_OFFSET && c->sub == 2)
        return 180.0 / M_PI; /* yaw: rad -> deg */
    return in->scale;
}

int hf_output_write_help(FILE *out, const char *indent)
{
    for (int k = 0; k < HF_OUT_COUNT; k++) {
        const hf_output_info *in = &catalogue[k];
        char name[64], col[96];
        name_form(k, name, sizeof name);
        const char *at = in->at_load ? "@<load>" : "";
        if (k == HF_OUT_OFFSET)
            snprintf(col, sizeof col, "offset_<load>_{surge_m,sway_m,yaw_deg}");
        else if (k == HF_OUT_MAX_TENSION_AT || k == HF_OUT_MAX_UTILISATION_AT)
            snprintf(col, sizeof col, "%s@<load>%s%s, %s@<load>", in->column,
                     in->unit[0] ? "_" : "", in->unit,
                     k == HF_OUT_MAX_TENSION_AT ? "max_tension_line" : "worst_line");
        else if (in->at_load)
            snprintf(col, sizeof col, "%s%s%s%s%s", in->column, in->per_line ? "<line>" : "", at,
                     in->unit[0] ? "_" : "", in->unit);
        else
            snprintf(col, sizeof col, "%s%s%s%s", in->column, in->per_line ? "<line>" : "",
                     in->unit[0] ? "_" : "", in->unit);
        if (fprintf(out, "%s%-27s %s\n%s%-27s %s\n", indent, name, col, indent, "", in->meaning) <
            0)
            return -1;
    }
    return 0;
}

const char *hf_output_unit_for_column(hf_dim d, char *buf, size_t cap)
{
    const char *u = d == HF_DIM_ANGLE ? "deg" : hf_dim_si(d);
    size_t n = 0;
    for (const char *p = u; *p && n + 1 < cap; p++)
        if (*p != ' ')
            buf[n++] = *p;
    if (cap)
        buf[n] = '\0';
    return buf;
}
