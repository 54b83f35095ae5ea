/* report.c - the self-contained HTML report: streamed sections, tables, inline figures, checks. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/caution.h"
#include "holdfast/criteria.h"
#include "holdfast/report_design.h"
#include "holdfast/report.h"
#include "holdfast/results.h"
#include "holdfast/svg.h"

#ifndef HF_VERSION
#define HF_VERSION "(unknown version)"
#endif

/* The stylesheet: our own look.  Black on white, one sans-serif family,
 * tables with hairlines, PASS/FAIL in words with weight and a frame (colour
 * only repeats what the word says), figures scale with the page, and print
 * keeps tables and figures whole. */
static const char css[] =
    "body{display:flex;flex-direction:column;max-width:1100px;margin:0 auto;padding:24px 32px;"
    "font-family:'DejaVu Sans',Verdana,Helvetica,Arial,sans-serif;font-size:15px;"
    "line-height:1.45;color:#000;background:#fff}\n"
    "header{order:-2}.verdict{order:-1}\n"
    "h1{font-size:26px;margin:0 0 4px}h2{font-size:20px;margin:28px 0 8px;"
    "padding-top:10px;border-top:3px solid #000}h3{font-size:16px;margin:18px 0 6px}\n"
    ".meta{color:#000;font-size:13px;margin:0 0 12px}\n"
    ".caution{border:2px solid #000;background:#fff6d6;padding:10px 14px;margin:12px 0;"
    "font-size:14px}\n"
    ".verdict{font-size:18px;font-weight:bold;padding:10px 14px;margin:8px 0 4px;"
    "border:3px solid #000}\n"
    ".verdict.ok{background:#e3f1e8}.verdict.bad{background:#fbe0dc}"
    ".verdict.none{background:#f0f0f0}.verdict.partial{background:#fff0c2}\n"
    ".verdict .scope{display:block;font-size:14px;font-weight:normal;margin-top:4px}\n"
    "table{border-collapse:collapse;margin:8px 0 16px;font-size:13.5px}\n"
    "table.component{min-width:60%}table.component td:last-child{font-size:12.5px}\n"
    "caption{text-align:left;font-weight:bold;padding:4px 0}\n"
    "th,td{border-bottom:1px solid #9a9a9a;padding:4px 10px;text-align:left;vertical-align:top}\n"
    "th{border-bottom:2px solid #000;background:#f2f2f2}"
    "th[scope=row]{border-bottom:1px solid #9a9a9a;white-space:nowrap}\n"
    "tbody tr:nth-child(even){background:#fafafa}td:first-child{white-space:nowrap}\n"
    "td.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}\n"
    "td.pass{font-weight:bold;color:#005a32}\n"
    "td.fail{font-weight:bold;color:#fff;background:#a4161a}\n"
    ".src{display:block;font-size:11.5px;color:#333}\n"
    ".note{border-left:4px solid #555;padding:6px 12px;margin:10px 0;background:#f6f6f6}\n"
    ".note.warning{border:2px solid #000;border-left-width:8px;background:#fff6d6}\n"
    "figure{margin:14px 0 22px}figure svg{max-width:100%;height:auto;display:block}\n"
    "figcaption{font-size:13.5px;margin-top:4px}\n"
    "footer{margin-top:28px;padding-top:8px;border-top:1px solid #000;font-size:12.5px}\n"
    "@media print{body{max-width:none;padding:0;font-size:11pt}"
    "figure,table,.caution,.verdict{break-inside:avoid}h2{break-after:avoid}}\n";

void hf_report_escape(FILE *out, const char *s)
{
    hf_svg_escape(out, s);
}

static void esc(hf_report *r, const char *s)
{
    hf_svg_escape(r->out, s);
}

/* The caution as one flowing paragraph: its hard line breaks become spaces. */
static void caution(hf_report *r)
{
    fputs("<div class=\"caution\">", r->out);
    char buf[512];
    size_t n = strlen(hf_caution_text);
    if (n >= sizeof buf)
        n = sizeof buf - 1;
    memcpy(buf, hf_caution_text, n);
    buf[n] = '\0';
    while (n > 0 && buf[n - 1] == '\n')
        buf[--n] = '\0';
    for (char *p = buf; *p; p++)
        if (*p == '\n')
            *p = ' ';
    esc(r, buf);
    fputs("</div>\n", r->out);
}

/* <tag>escaped text</tag> */
static void elem(hf_report *r, const char *tag, const char *text)
{
    fprintf(r->out, "<%s>", tag);
    esc(r, text);
    fprintf(r->out, "</%s>\n", tag);
}

void hf_report_number(char *buf, size_t cap, double v, int digits)
{
    if (digits < 1)
        digits = 1;
    if (digits > 10)
        digits = 10;
    if (!isfinite(v)) {
        snprintf(buf, cap, "-");
        return;
    }
    double a = fabs(v);
    if (a == 0.0) {
        snprintf(buf, cap, "0");
        return;
    }
    if (a >= 1e-3 && a < 1e9) {
        int e = (int)floor(log10(a));
        int dec = digits - 1 - e;
        if (dec < 0)
            dec = 0;
        /* round to the significant digits first (1234.5 at 3 digits: 1230) */
        double q = pow(10.0, digits - 1 - e);
        double rv = round(v * q) / q;
        snprintf(buf, cap, "%.*f", dec, rv);
        if (strchr(buf, '.')) {
            size_t n = strlen(buf);
            while (n > 0 && buf[n - 1] == '0')
                buf[--n] = '\0';
            if (n > 0 && buf[n - 1] == '.')
                buf[--n] = '\0';
        }
        if (!strcmp(buf, "-0"))
            snprintf(buf, cap, "0");
        return;
    }
    snprintf(buf, cap, "%.*g", digits, v);
}

/* Closes the open table of either kind. */
static void close_table(hf_report *r)
{
    if (r->in_table)
        fputs("</tbody></table>\n", r->out);
    r->in_table = 0;
}

static void close_section(hf_report *r)
{
    close_table(r);
    if (r->in_section)
        fputs("</section>\n", r->out);
    r->in_section = 0;
}

void hf_report_section(hf_report *r, const char *heading, const char *intro)
{
    close_section(r);
    fputs("<section>\n", r->out);
    elem(r, "h2", heading);
    if (intro)
        elem(r, "p", intro);
    r->in_section = 1;
    r->nsections++;
}

void hf_report_paragraph(hf_report *r, const char *text)
{
    close_table(r);
    elem(r, "p", text);
}

void hf_report_note(hf_report *r, const char *kind, const char *text)
{
    close_table(r);
    int warn = kind && !strcmp(kind, "warning");
    fprintf(r->out, "<p class=\"note%s\">%s", warn ? " warning" : "",
            warn ? "<b>Warning:</b> " : "");
    esc(r, text);
    fputs("</p>\n", r->out);
}

void hf_report_table_begin(hf_report *r, const char *caption, const char *const *columns,
                           size_t ncols)
{
    close_table(r);
    fputs("<table>", r->out);
    if (caption)
        elem(r, "caption", caption);
    fputs("<thead><tr>", r->out);
    for (size_t i = 0; i < ncols; i++) {
        fputs("<th>", r->out);
        esc(r, columns ? columns[i] : NULL);
        fputs("</th>", r->out);
    }
    fputs("</tr></thead><tbody>\n", r->out);
    r->in_table = 1;
    r->ncols = ncols;
    r->ntables++;
}

/* True when s reads as a number (right-aligned in tables). */
static int numeric(const char *s)
{
    if (!s || !*s)
        return 0;
    char *end;
    (void)strtod(s, &end);
    return end != s && *end == '\0';
}

void hf_report_table_row(hf_report *r, const char *const *cells)
{
    if (r->in_table != 1)
        return; /* no data table open: a caller bug, ignored rather than breaking the page */
    fputs("<tr>", r->out);
    for (size_t i = 0; i < r->ncols; i++) {
        const char *c = cells ? cells[i] : NULL;
        fputs(numeric(c) ? "<td class=\"num\">" : "<td>", r->out);
        esc(r, c);
        fputs("</td>", r->out);
    }
    fputs("</tr>\n", r->out);
}

void hf_report_table_row_numbers(hf_report *r, const char *label, const double *values, int digits)
{
    if (r->in_table != 1)
        return;
    fputs("<tr><td>", r->out);
    esc(r, label);
    fputs("</td>", r->out);
    for (size_t i = 0; i + 1 < r->ncols; i++) {
        char b[48];
        hf_report_number(b, sizeof b, values[i], digits);
        fputs("<td class=\"num\">", r->out);
        esc(r, b);
        fputs("</td>", r->out);
    }
    fputs("</tr>\n", r->out);
}

void hf_report_table_end(hf_report *r)
{
    close_table(r);
}

FILE *hf_report_figure_begin(hf_report *r)
{
    close_table(r);
    fputs("<figure>\n", r->out);
    r->nfigures++;
    return r->out;
}

void hf_report_figure_end(hf_report *r, const char *caption)
{
    if (caption) {
        char num[32];
        snprintf(num, sizeof num, "Figure %zu. ", r->nfigures);
        fprintf(r->out, "<figcaption><b>%s</b>", num);
        esc(r, caption);
        fputs("</figcaption>\n", r->out);
    }
    fputs("</figure>\n", r->out);
}

void hf_report_check(hf_report *r, const char *item, const char *requirement, const char *result,
                     int passed)
{
    if (r->in_table != 2) {
        close_table(r);
        fputs("<table class=\"checks\"><caption>Criteria checks</caption><thead><tr>"
              "<th>What is checked</th><th>Requirement</th><th>Result</th><th>Verdict</th>"
              "</tr></thead><tbody>\n",
              r->out);
        r->in_table = 2;
    }
    fputs("<tr><td>", r->out);
    esc(r, item);
    fputs("</td><td>", r->out);
    esc(r, requirement);
    fputs(numeric(result) ? "</td><td class=\"num\">" : "</td><td>", r->out);
    esc(r, result);
    fputs(passed ? "</td><td class=\"pass\">PASS</td></tr>\n"
                 : "</td><td class=\"fail\">FAIL</td></tr>\n",
          r->out);
    r->nchecks++;
    if (!passed)
        r->nfailed++;
}

/* ---- the case sections ---------------------------------------------------- */

static const char *anchor_kind(hf_anchor_kind k)
{
    switch (k) {
    case HF_ANCHOR_DRAG:
        return "drag-embedment anchor";
    case HF_ANCHOR_GRAVITY:
        return "gravity block";
    case HF_ANCHOR_PILE:
        return "pile";
    case HF_ANCHOR_PLATE:
        return "plate anchor";
    }
    return "anchor";
}

/* A two-column "what: value" row. */
static void kv(hf_report *r, const char *k, const char *v)
{
    fputs("<tr><th scope=\"row\">", r->out);
    esc(r, k);
    fputs("</th><td>", r->out);
    esc(r, v);
    fputs("</td></tr>\n", r->out);
}

/* A direction in the one convention of holdfast's outputs: degrees in
 * [0, 360), counter-clockwise from global x (hf_svg_direction_label),
 * without the unit (the column heading carries it). */
static void direction_deg(char *buf, size_t cap, double rad)
{
    hf_svg_direction_label(rad, buf, cap);
    char *u = strstr(buf, " deg");
    if (u)
        *u = '\0';
}

static void case_section(hf_report *r, const hf_model *m)
{
    char a[64], b[64], c[64], t[512];
    hf_report_section(r, "Case", NULL);
    fputs("<table><caption>Site, hull and criteria</caption><tbody>\n", r->out);
    kv(r, "case file", m->source_path ? m->source_path : "(not from a file)");
    hf_report_number(a, sizeof a, m->site.depth, 5);
    hf_report_number(b, sizeof b, m->site.water_level, 4);
    hf_report_number(c, sizeof c, m->site.water_density, 5);
    snprintf(t, sizeof t,
             "%s m below datum; still water level %s m above datum; water %s kg/m\xc2\xb3", a, b,
             c);
    kv(r, "seabed (flat)", t);
    hf_report_number(a, sizeof a, m->hull.position[0], 6);
    hf_report_number(b, sizeof b, m->hull.position[1], 6);
    hf_report_number(c, sizeof c, m->hull.heading * 180.0 / M_PI, 5);
    snprintf(t, sizeof t, "reference point at x = %s m, y = %s m; heading %s deg%s", a, b, c,
             m->hull.noutline ? "; outline given" : "");
    kv(r, "hull", t);
    snprintf(t, sizeof t, "%zu", m->nlines);
    kv(r, "mooring lines", t);
    const hf_criteria *cr = &m->criteria;
    if (cr->factor_intact > 0 || cr->factor_damaged > 0 || cr->max_offset > 0) {
        snprintf(a, sizeof a, "%.2f", cr->factor_intact);
        snprintf(b, sizeof b, "%.2f", cr->factor_damaged);
        hf_report_number(c, sizeof c, cr->max_offset, 4);
        snprintf(t, sizeof t,
                 "%s%s%s%s analysis; required line safety factor MBL/T: %s intact, %s with "
                 "one line broken; %s",
                 cr->preset ? "preset " : "", cr->preset ? cr->preset : "", cr->preset ? ", " : "",
                 cr->analysis == HF_ANALYSIS_DYNAMIC ? "dynamic" : "quasi-static",
                 cr->factor_intact > 0 ? a : "(none)", cr->factor_damaged > 0 ? b : "(none)",
                 cr->max_offset > 0 ? "offset at most " : "no offset limit");
        if (cr->max_offset > 0) {
            size_t n = strlen(t);
            snprintf(t + n, sizeof t - n, "%s m", c);
        }
        kv(r, "criteria", t);
        kv(r, "criteria source", cr->source ? cr->source : "given in the case file");
    } else {
        kv(r, "criteria", "none given: no pass/fail checks are made");
    }
    fputs("</tbody></table>\n", r->out);

    if (m->nloads) {
        static const char *const cols[] = {
            "load case",          "direct force (kN)", "toward (deg)",          "yaw moment (kN m)",
            "wind/current terms", "resultant (kN)",    "resultant toward (deg)"};
        hf_report_table_begin(r, "Load cases (mean loads on the hull)", cols, 7);
        for (size_t i = 0; i < m->nloads; i++) {
            const hf_load *ld = &m->loads[i];
            /* the resultant: direct force plus every drag term (balance.h) */
            double lf[3] = {0.0, 0.0, 0.0};
            (void)hf_balance_load_force(ld, lf, NULL); /* a case that loaded is valid */
            double fx = lf[0], fy = lf[1];
            char f1[48], f2[48], f3[48], f4[16], f5[48], f6[48];
            hf_report_number(f1, sizeof f1, ld->force / 1e3, 4);
            direction_deg(f2, sizeof f2, ld->direction);
            hf_report_number(f3, sizeof f3, ld->moment / 1e3, 4);
            snprintf(f4, sizeof f4, "%zu", ld->ndrag);
            hf_report_number(f5, sizeof f5, hypot(fx, fy) / 1e3, 4);
            if (hypot(fx, fy) > 0)
                direction_deg(f6, sizeof f6, atan2(fy, fx));
            else
                snprintf(f6, sizeof f6, "-"); /* no resultant, no direction */
            const char *cells[7] = {ld->name, f1, f2, f3, f4, f5, f6};
            hf_report_table_row(r, cells);
        }
        hf_report_table_end(r);
    }
    hf_report_design_case(r, m); /* issue 14: hull design data, environments */
}

/* One property row: name, value with unit, source. */
static void prop_row(hf_report *r, const hf_component *c, hf_component_prop p, const char *name,
                     double scale, const char *unit, int digits)
{
    char v[48];
    hf_report_number(v, sizeof v, c->value[p] * scale, digits);
    fputs("<tr><td>", r->out);
    esc(r, name);
    fputs("</td><td class=\"num\">", r->out);
    esc(r, v);
    if (unit && *unit) {
        fputs(" ", r->out);
        esc(r, unit);
    }
    fputs("</td><td>", r->out);
    esc(r, (c->given >> p) & 1u ? "given in the case file" : c->source[p] ? c->source[p] : "");
    fputs("</td></tr>\n", r->out);
}

static void components_section(hf_report *r, const hf_model *m)
{
    hf_report_section(r, "Components",
                      "Resolved properties of every component, each with where it came from: "
                      "given in the case file, or the formula and reference that derived it.");
    int approx = 0;
    for (size_t i = 0; i < m->ncomponents; i++) {
        const hf_model_component *mc = &m->components[i];
        const hf_component *c = &mc->comp;
        char cap[HF_MODEL_MAX_NAME + 160], d[48];
        int n = snprintf(cap, sizeof cap, "%.*s: %s", HF_MODEL_MAX_NAME, mc->name,
                         hf_component_type_name(c->type));
        if (c->grade != HF_GRADE_NONE && n > 0 && (size_t)n < sizeof cap)
            n += snprintf(cap + n, sizeof cap - (size_t)n, ", grade %s",
                          hf_component_grade_name(c->grade));
        if (c->diameter > 0 && n > 0 && (size_t)n < sizeof cap) {
            hf_report_number(d, sizeof d, c->diameter * 1e3, 4);
            n += snprintf(cap + n, sizeof cap - (size_t)n, ", nominal diameter %s mm", d);
        }
        if (c->approximate && n > 0 && (size_t)n < sizeof cap) {
            snprintf(cap + n, sizeof cap - (size_t)n, " (approximate values, see below)");
            approx = 1;
        }
        fputs("<table class=\"component\">", r->out);
        elem(r, "caption", cap);
        fputs("<thead><tr><th>property</th><th>value</th><th>source</th></tr></thead><tbody>\n",
              r->out);
        prop_row(r, c, HF_PROP_MASS, "mass in air", 1.0, "kg/m", 4);
        prop_row(r, c, HF_PROP_WET_WEIGHT, "wet weight", 1.0, "N/m", 4);
        prop_row(r, c, HF_PROP_EA, "axial stiffness EA", 1e-6, "MN", 4);
        prop_row(r, c, HF_PROP_MBL, "minimum breaking load", 1e-3, "kN", 5);
        prop_row(r, c, HF_PROP_FRICTION, "seabed friction coefficient", 1.0, "", 3);
        fputs("</tbody></table>\n", r->out);
        r->ntables++;
    }
    if (approx)
        hf_report_note(r, "warning",
                       "Some component values come from approximate formulas (marked "
                       "\"approximate values\"). Enter the manufacturer's catalogue values "
                       "before relying on the results.");
}

static void lines_section(hf_report *r, const hf_model *m)
{
    hf_report_section(r, "Lines", "Each line from its anchor (first) to its fairlead (last).");
    static const char *const cols[] = {
        "line",   "anchor x, y (m)",       "fairlead x, y, z on the hull (m)",
        "anchor", "make-up, anchor first", "length (m)"};
    hf_report_table_begin(r, NULL, cols, 6);
    for (size_t i = 0; i < m->nlines; i++) {
        const hf_model_line *ml = &m->lines[i];
        char an[160], fl[200], make[1024], len[48], x[3][48];
        hf_report_number(x[0], sizeof x[0], ml->anchor[0], 6);
        hf_report_number(x[1], sizeof x[1], ml->anchor[1], 6);
        snprintf(an, sizeof an, "%s, %s", x[0], x[1]);
        for (int k = 0; k < 3; k++)
            hf_report_number(x[k], sizeof x[k], ml->fairlead[k], 5);
        snprintf(fl, sizeof fl, "%s, %s, %s", x[0], x[1], x[2]);
        size_t n = 0;
        make[0] = '\0';
        for (size_t k = 0; k < ml->npieces && n < sizeof make - 64; k++) {
            const hf_piece *p = &ml->pieces[k];
            char v[48];
            const char *sepr = k ? " + " : "";
            if (p->kind == HF_PIECE_SECTION) {
                hf_report_number(v, sizeof v, p->length, 5);
                const char *cn =
                    p->component < m->ncomponents ? m->components[p->component].name : "?";
                n += (size_t)snprintf(make + n, sizeof make - n, "%s%.200s %s m", sepr, cn, v);
            } else {
                hf_report_number(v, sizeof v, p->load / 1e3, 4);
                n += (size_t)snprintf(make + n, sizeof make - n, "%s%s %s kN%s", sepr,
                                      p->kind == HF_PIECE_CLUMP ? "clump" : "buoy", v,
                                      p->kind == HF_PIECE_BUOY ? " lift" : "");
            }
            if (n >= sizeof make)
                n = sizeof make - 1;
        }
        hf_report_number(len, sizeof len, hf_line_length(&ml->line), 6);
        const char *cells[6] = {ml->name, an, fl, anchor_kind(ml->anchor_spec.kind), make, len};
        hf_report_table_row(r, cells);
    }
    hf_report_table_end(r);
}

/* ---- the scope of the checks ------------------------------------------------ */

static void scope_begin(hf_report *r, const hf_model *m)
{
    r->model = m;
    if (!m)
        return;
    r->scope_load = hf_calloc(m->nloads ? m->nloads : 1, 1);
    r->scope_cond = hf_calloc(m->nlines + 1, 1);
    r->scope_lost = !r->scope_load || !r->scope_cond;
}

static void scope_free(hf_report *r)
{
    hf_free(r->scope_load);
    hf_free(r->scope_cond);
    r->scope_load = r->scope_cond = NULL;
}

/* Two levels are one when they differ by less than a micrometre (levels are
 * entered in m with a few decimals; a sweep's grid values carry rounding). */
static int same_level(double a, double b)
{
    return fabs(a - b) <= 1e-6;
}

void hf_report_scope_add(hf_report *r, size_t load, size_t cond, double level)
{
    const hf_model *m = r->model;
    if (!m || !r->scope_load || !r->scope_cond || load >= m->nloads || cond > m->nlines ||
        !isfinite(level)) {
        r->scope_lost = 1;
        return;
    }
    r->nscoped++;
    r->scope_load[load] = 1;
    r->scope_cond[cond] = 1;
    for (size_t i = 0; i < r->nscope_levels; i++)
        if (same_level(r->scope_level[i], level))
            return;
    if (r->nscope_levels < HF_REPORT_MAX_LEVELS)
        r->scope_level[r->nscope_levels++] = level;
    else
        r->scope_lost = 1;
}

size_t hf_report_levels_declared(const hf_model *m, double *out, size_t cap)
{
    return m ? hf_analysis_envelope_levels(m, out, cap) : 0;
}

/* What the checks covered against what the case declares. */
typedef struct {
    size_t loads, loads_done;   /* load cases */
    size_t levels, levels_done; /* declared still water levels, of them checked */
    double lo, hi;              /* the declared levels' range, m */
    size_t conds, conds_done;   /* conditions: intact + each line broken */
    int complete;               /* every declared load, level and condition checked */
} scope_count;

static void scope_counts(const hf_report *r, scope_count *c)
{
    const hf_model *m = r->model;
    double lv[HF_REPORT_MAX_LEVELS];
    memset(c, 0, sizeof *c);
    c->loads = m->nloads;
    c->conds = m->nlines + 1;
    c->levels = hf_report_levels_declared(m, lv, HF_REPORT_MAX_LEVELS);
    for (size_t i = 0; i < m->nloads && r->scope_load; i++)
        c->loads_done += r->scope_load[i];
    for (size_t i = 0; i <= m->nlines && r->scope_cond; i++)
        c->conds_done += r->scope_cond[i];
    c->lo = c->hi = c->levels ? lv[0] : 0.0;
    for (size_t i = 0; i < c->levels && i < HF_REPORT_MAX_LEVELS; i++) {
        c->lo = fmin(c->lo, lv[i]);
        c->hi = fmax(c->hi, lv[i]);
        for (size_t j = 0; j < r->nscope_levels; j++)
            if (same_level(lv[i], r->scope_level[j])) {
                c->levels_done++;
                break;
            }
    }
    c->complete = !r->scope_lost && c->loads > 0 && c->loads_done == c->loads &&
                  c->conds_done == c->conds && c->levels_done == c->levels;
}

/* "1.9 m" or "0 to 3.4 m" for the range lo..hi. */
static void level_range(char *buf, size_t cap, double lo, double hi)
{
    char a[32], b[32];
    hf_report_number(a, sizeof a, lo, 4);
    hf_report_number(b, sizeof b, hi, 4);
    if (same_level(lo, hi))
        snprintf(buf, cap, "%s m", a);
    else
        snprintf(buf, cap, "%s to %s m", a, b);
}

/* The scope sentence: "2 of 2 load cases x 1 of 1 still water level
 * (1.9 m above datum) x 5 of 5 conditions (intact and each of the 4 lines
 * broken)". */
static void scope_sentence(const scope_count *c, char *buf, size_t cap)
{
    char lv[80];
    level_range(lv, sizeof lv, c->lo, c->hi);
    snprintf(buf, cap,
             "%zu of %zu load case%s \xc3\x97 %zu of %zu still water level%s (%s above datum) "
             "\xc3\x97 %zu "
             "of %zu conditions (intact and each of the %zu line%s broken)",
             c->loads_done, c->loads, c->loads == 1 ? "" : "s", c->levels_done, c->levels,
             c->levels == 1 ? "" : "s", lv, c->conds_done, c->conds, c->conds - 1,
             c->conds == 2 ? "" : "s");
}

/* What was left out, for the amber banner. */
static void scope_missing(const hf_report *r, const scope_count *c, char *buf, size_t cap)
{
    size_t n = 0;
    buf[0] = '\0';
    if (c->loads_done < c->loads)
        n += (size_t)snprintf(buf + n, cap - n, " %zu load case%s not checked;",
                              c->loads - c->loads_done, c->loads - c->loads_done == 1 ? "" : "s");
    if (c->levels_done < c->levels && n < cap)
        n += (size_t)snprintf(buf + n, cap - n, " %zu declared water level%s not checked;",
                              c->levels - c->levels_done,
                              c->levels - c->levels_done == 1 ? "" : "s");
    if (c->conds_done < c->conds && n < cap)
        n += (size_t)snprintf(buf + n, cap - n,
                              " %zu condition%s (intact or a line broken) not "
                              "checked;",
                              c->conds - c->conds_done, c->conds - c->conds_done == 1 ? "" : "s");
    if ((r->scope_lost || r->nscoped < r->nchecks) && n < cap)
        snprintf(buf + n, cap - n, " some checks did not record what they covered;");
}

/* The anchor part of the criteria sentence: the checks by anchor kind,
 * the gravity blocks' required factors (the case's, or a range when lines
 * set their own) and the anchor-load choice (seabed friction). */
static void anchors_sentence(const hf_model *m, char *buf, size_t cap)
{
    int drag = 0, gravity = 0, other = 0;
    double s_lo = INFINITY, s_hi = 0, u_lo = INFINITY, u_hi = 0;
    for (size_t i = 0; i < m->nlines; i++) {
        const hf_anchor *a = &m->lines[i].anchor_spec;
        drag |= a->kind == HF_ANCHOR_DRAG;
        other |= a->kind == HF_ANCHOR_PILE || a->kind == HF_ANCHOR_PLATE;
        if (a->kind != HF_ANCHOR_GRAVITY)
            continue;
        gravity = 1;
        double rs, ru;
        hf_criteria_block_required(&m->criteria, a, &rs, &ru);
        s_lo = fmin(s_lo, rs), s_hi = fmax(s_hi, rs), u_lo = fmin(u_lo, ru), u_hi = fmax(u_hi, ru);
    }
    char f[4][32], sl[80] = "", ul[80] = "";
    hf_report_number(f[0], 32, s_lo, 4);
    hf_report_number(f[1], 32, s_hi, 4);
    hf_report_number(f[2], 32, u_lo, 4);
    hf_report_number(f[3], 32, u_hi, 4);
    if (gravity) {
        snprintf(sl, sizeof sl, s_lo == s_hi ? "%s" : "%s to %s", f[0], f[1]);
        snprintf(ul, sizeof ul, u_lo == u_hi ? "%s" : "%s to %s", f[2], f[3]);
    }
    size_t n = (size_t)snprintf(buf, cap, "anchors:%s%s",
                                drag ? " drag anchors no uplift beyond "
                                       "their allowed angle"
                                     : "",
                                drag && gravity ? "," : "");
    if (gravity && n < cap)
        n += (size_t)snprintf(buf + n, cap - n,
                              " gravity blocks sliding factor at least %s and uplift factor at "
                              "least %s",
                              sl, ul);
    if (other && n < cap)
        n += (size_t)snprintf(buf + n, cap - n, "%s piles and plates reported without a check",
                              drag || gravity ? "," : "");
    if (n < cap)
        snprintf(buf + n, cap - n, "; anchor loads %s",
                 m->criteria.anchor_ignore_friction
                     ? "with the grounded line's seabed friction ignored (anchor_line_friction: "
                       "ignore)"
                     : "as solved, the grounded line's seabed friction included");
}

/* Which criteria the checks apply: line factors, offset limit, anchors. */
static void criteria_sentence(const hf_model *m, char *buf, size_t cap)
{
    const hf_criteria *cr = &m->criteria;
    char a[32], b[32], o[48], an[400];
    hf_report_number(a, sizeof a, cr->factor_intact, 4);
    hf_report_number(b, sizeof b, cr->factor_damaged, 4);
    hf_report_number(o, sizeof o, cr->max_offset, 4);
    anchors_sentence(m, an, sizeof an);
    snprintf(buf, cap,
             "Criteria: line safety factor MBL/T at least %s intact and %s with one line "
             "broken%s%s%s, and no line at its MBL; %s%s%s; %s.",
             cr->factor_intact > 0 ? a : "(none)", cr->factor_damaged > 0 ? b : "(none)",
             cr->preset ? " (" : "", cr->preset ? cr->preset : "", cr->preset ? ")" : "",
             cr->max_offset > 0 ? "horizontal offset at most " : "no offset limit",
             cr->max_offset > 0 ? o : "", cr->max_offset > 0 ? " m" : "", an);
}

/* The verdict banner (shown first by CSS order). */
static void verdict(hf_report *r)
{
    FILE *out = r->out;
    if (r->nchecks == 0) {
        fputs("<div class=\"verdict none\">No criteria checks were made.", out);
        if (r->model && r->model->nloads)
            fprintf(out,
                    "<span class=\"scope\">The case declares %zu load case%s; no balance "
                    "study checked %s.</span>",
                    r->model->nloads, r->model->nloads == 1 ? "" : "s",
                    r->model->nloads == 1 ? "it" : "them");
        fputs("</div>\n", out);
        return;
    }
    if (!r->model) {
        if (r->nfailed == 0)
            fprintf(out, "<div class=\"verdict ok\">All %zu criteria check%s passed.</div>\n",
                    r->nchecks, r->nchecks == 1 ? "" : "s");
        else
            fprintf(out,
                    "<div class=\"verdict bad\">%zu of %zu criteria check%s FAILED. The failed "
                    "checks are marked FAIL in the tables below.</div>\n",
                    r->nfailed, r->nchecks, r->nchecks == 1 ? "" : "s");
        return;
    }
    scope_count c;
    scope_counts(r, &c);
    char sc[512], cr[1024], miss[400];
    scope_sentence(&c, sc, sizeof sc);
    criteria_sentence(r->model, cr, sizeof cr);
    scope_missing(r, &c, miss, sizeof miss);
    int complete = c.complete && r->nscoped >= r->nchecks;
    const char *cls = r->nfailed ? "bad" : complete ? "ok" : "partial";
    fprintf(out, "<div class=\"verdict %s\">", cls);
    if (r->nfailed)
        fprintf(out,
                "%zu of %zu criteria check%s FAILED. The failed checks are marked FAIL in the "
                "tables below.",
                r->nfailed, r->nchecks, r->nchecks == 1 ? "" : "s");
    else if (complete)
        fprintf(out, "All %zu criteria check%s passed, covering everything the case declares.",
                r->nchecks, r->nchecks == 1 ? "" : "s");
    else
        fprintf(out,
                "All %zu criteria check%s passed, but they cover less than the case declares: "
                "this is not a verdict on the whole case.",
                r->nchecks, r->nchecks == 1 ? "" : "s");
    fputs("<span class=\"scope\">Checked: ", out);
    esc(r, sc);
    fputs(".", out);
    if (miss[0]) {
        fputs(" Not checked:", out);
        esc(r, miss);
    }
    fputs(" ", out);
    esc(r, cr);
    fputs("</span></div>\n", out);
}

void hf_report_begin(hf_report *r, FILE *out, const hf_model *m, const char *command)
{
    memset(r, 0, sizeof *r);
    r->out = out;
    scope_begin(r, m);
    const char *title = m && m->title         ? m->title
                        : m && m->source_path ? m->source_path
                                              : "holdfast";
    fputs("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n"
          "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n"
          "<meta name=\"generator\" content=\"holdfast " HF_VERSION "\"/>\n<title>",
          out);
    esc(r, title);
    fputs(" - mooring report</title>\n<style>\n", out);
    fputs(css, out);
    fputs("</style>\n</head>\n<body>\n<header>\n", out);
    elem(r, "h1", title);
    fputs("<p class=\"meta\">Quasi-static mooring analysis report written by holdfast " HF_VERSION,
          out);
    if (command) {
        fputs(" (", out);
        esc(r, command);
        fputs(")", out);
    }
    fputs(".</p>\n", out);
    caution(r);
    fputs("</header>\n", out);
    if (m) {
        case_section(r, m);
        components_section(r, m);
        lines_section(r, m);
    }
}

hf_status hf_report_end(hf_report *r, hf_error *err)
{
    close_section(r);
    FILE *out = r->out;
    verdict(r);
    scope_free(r);
    fputs("<footer>\n", out);
    caution(r);
    fputs("<p>Passing these checks is not an approval. holdfast is free software "
          "(GPL-3.0-or-later) and comes with no warranty.</p>\n</footer>\n</body>\n</html>\n",
          out);
    if (ferror(out))
        return hf_error_set(err, HF_EIO, "writing the report failed");
    return HF_OK;
}

/* ---- model-aware figures -------------------------------------------------- */

hf_status hf_report_svg_plan(FILE *out, const hf_model *m, const hf_pose *pose,
                             const unsigned char *broken, const hf_load *load, int standalone,
                             hf_error *err)
{
    if (!m || m->nlines == 0)
        return hf_error_set(err, HF_EINVAL, "plan figure: the case has no lines");
    hf_pose rest;
    if (!pose) {
        hf_spread_pose_rest(m, &rest);
        pose = &rest;
    }
    size_t n = m->nlines, no = m->hull.noutline;
    double(*anc)[2] = hf_malloc(n * sizeof *anc);
    double(*fl)[2] = hf_malloc(n * sizeof *fl);
    double(*ol)[2] = hf_malloc((no ? no : 1) * sizeof *ol);
    double(*rol)[2] = hf_malloc((no ? no : 1) * sizeof *rol);
    const char **names = hf_malloc(n * sizeof *names);
    hf_status s = HF_OK;
    if (!anc || !fl || !ol || !rol || !names) {
        s = hf_error_set(err, HF_ENOMEM, "plan figure: out of memory");
        goto done;
    }
    for (size_t i = 0; i < n; i++) {
        hf_spread_geom g;
        s = hf_spread_line_geometry(m, i, pose, &g, err);
        if (s != HF_OK)
            goto done;
        anc[i][0] = m->lines[i].anchor[0];
        anc[i][1] = m->lines[i].anchor[1];
        fl[i][0] = g.fairlead[0];
        fl[i][1] = g.fairlead[1];
        names[i] = m->lines[i].name;
    }
    hf_pose rp;
    hf_spread_pose_rest(m, &rp);
    double R[3][3], RR[3][3];
    hf_spread_pose_rotation(pose, R);
    hf_spread_pose_rotation(&rp, RR);
    for (size_t i = 0; i < no; i++) {
        /* hull-frame outline point at the still water level: p = pos + R o */
        double ox = m->hull.outline[i][0], oy = m->hull.outline[i][1];
        ol[i][0] = pose->surge + R[0][0] * ox + R[0][1] * oy;
        ol[i][1] = pose->sway + R[1][0] * ox + R[1][1] * oy;
        rol[i][0] = rp.surge + RR[0][0] * ox + RR[0][1] * oy;
        rol[i][1] = rp.sway + RR[1][0] * ox + RR[1][1] * oy;
    }
    hf_svg_plan p = {0};
    char title[256], label[200];
    /* inline in the report, whose heading names the case, the title is short */
    if (standalone)
        snprintf(title, sizeof title, "Plan of the spread: %.200s", m->title ? m->title : "case");
    else
        snprintf(title, sizeof title, "Plan of the spread");
    p.title = title;
    p.nlines = n;
    p.names = names;
    p.anchor = (const double(*)[2])anc;
    p.fairlead = (const double(*)[2])fl;
    p.broken = broken;
    p.noutline = no;
    p.outline = (const double(*)[2])ol;
    p.reference[0] = pose->surge;
    p.reference[1] = pose->sway;
    if (load) {
        double lf[3] = {0.0, 0.0, 0.0};
        (void)hf_balance_load_force(load, lf, NULL); /* resultant, balance.h */
        double fx = lf[0], fy = lf[1];
        if (hypot(fx, fy) > 0) {
            p.has_load = 1;
            p.load_direction = atan2(fy, fx);
            char kn[48];
            hf_report_number(kn, sizeof kn, hypot(fx, fy) / 1e3, 4);
            snprintf(label, sizeof label, "%.120s: %s kN", load->name ? load->name : "load", kn);
            p.load_label = label;
        }
    }
    /* away from rest: show the rest pose in the hull detail */
    if (pose->surge != rp.surge || pose->sway != rp.sway || pose->yaw != rp.yaw) {
        p.has_rest = 1;
        p.rest_reference[0] = rp.surge;
        p.rest_reference[1] = rp.sway;
        p.rest_outline = no ? (const double(*)[2])rol : NULL;
    }
    s = hf_svg_figure_plan(out, &p, standalone, err);
done:
    hf_free(rol);
    hf_free(anc);
    hf_free(fl);
    hf_free(ol);
    hf_free(names);
    return s;
}

/* One line's elevation data: e (title left to the caller) with its profile
 * *pts and sections *secs (hf_malloc'd here; the caller frees both, also on
 * failure).  The allowed tension of each section is MBL / the intact factor
 * of the criteria (none without one). */
static hf_status elevation_data(const hf_model *m, size_t i, const hf_line_state *st,
                                hf_svg_elevation *e, hf_line_point **pts, hf_svg_section **secs,
                                hf_error *err)
{
    *pts = NULL;
    *secs = NULL;
    memset(e, 0, sizeof *e);
    if (!m || i >= m->nlines || !st || st->status != HF_OK)
        return hf_error_set(err, HF_EINVAL, "elevation figure: no solved line %zu", i);
    const hf_line *line = &m->lines[i].line;
    double spacing = hf_line_length(line) / 500.0;
    if (!(spacing > 0) || !isfinite(spacing))
        return hf_error_set(err, HF_EINVAL, "elevation figure: line %zu has no length", i);
    size_t n = hf_line_profile(line, st, spacing, NULL, 0);
    if (n < 2)
        return hf_error_set(err, HF_EINVAL, "elevation figure: line '%s' is not solved",
                            m->lines[i].name);
    size_t ns = hf_svg_sections_from_line(line, 0.0, NULL, 0);
    *pts = hf_malloc(n * sizeof **pts);
    *secs = hf_malloc((ns ? ns : 1) * sizeof **secs);
    if (!*pts || !*secs)
        return hf_error_set(err, HF_ENOMEM, "elevation figure: out of memory");
    e->pts = *pts;
    e->npts = hf_line_profile(line, st, spacing, *pts, n);
    e->water_height = hf_model_water_height(m);
    e->has_touchdown = st->regime == HF_LINE_TOUCHDOWN || st->regime == HF_LINE_SLACK;
    e->touchdown_x = st->touchdown_x;
    /* every section's MBL (overload marks) and allowed tension (drawn) */
    e->nsections =
        hf_svg_sections_from_line(line, hf_criteria_required(&m->criteria, 0), *secs, ns);
    e->sections = *secs;
    return HF_OK;
}

/* The title of line i's elevation: "Line bow: fairlead tension 812 kN, touchdown". */
static void elevation_title(const hf_model *m, size_t i, const hf_line_state *st, char *buf,
                            size_t cap)
{
    char kn[48];
    hf_report_number(kn, sizeof kn, st->tension / 1e3, 4);
    snprintf(buf, cap, "Line %.160s: fairlead tension %s kN, %s", m->lines[i].name, kn,
             hf_line_regime_name(st->regime));
}

hf_status hf_report_svg_elevation(FILE *out, const hf_model *m, size_t i, const hf_line_state *st,
                                  int standalone, hf_error *err)
{
    hf_svg_elevation e;
    hf_line_point *pts;
    hf_svg_section *secs;
    hf_status s = elevation_data(m, i, st, &e, &pts, &secs, err);
    char title[256];
    if (s == HF_OK) {
        elevation_title(m, i, st, title, sizeof title);
        e.title = title;
        s = hf_svg_figure_elevation(out, &e, standalone, err);
    }
    hf_free(pts);
    hf_free(secs);
    return s;
}

hf_status hf_report_svg_elevation_group(FILE *out, const hf_model *m, const size_t *idx, size_t n,
                                        const hf_line_state *st, int standalone, hf_error *err)
{
    if (!idx || n == 0 || n > m->nlines)
        return hf_error_set(err, HF_EINVAL, "elevation figure: no lines in the group");
    const char **names = hf_malloc(n * sizeof *names);
    if (!names)
        return hf_error_set(err, HF_ENOMEM, "elevation figure: out of memory");
    for (size_t k = 0; k < n; k++)
        names[k] = idx[k] < m->nlines ? m->lines[idx[k]].name : "?";
    hf_svg_elevation e;
    hf_line_point *pts;
    hf_svg_section *secs;
    hf_status s = elevation_data(m, idx[0], st, &e, &pts, &secs, err);
    char title[256];
    if (s == HF_OK) {
        elevation_title(m, idx[0], st, title, sizeof title);
        e.title = title;
        s = n == 1 ? hf_svg_figure_elevation(out, &e, standalone, err)
                   : hf_svg_figure_elevation_group(out, &e, names, n, standalone, err);
    }
    hf_free(pts);
    hf_free(secs);
    hf_free(names);
    return s;
}

hf_status hf_report_svg_elevation_overlay(FILE *out, const hf_model *m, const hf_spread_result *r,
                                          int standalone, hf_error *err)
{
    size_t nl = m ? m->nlines : 0, n = 0;
    if (!r || nl == 0)
        return hf_error_set(err, HF_EINVAL, "overlay figure: no solved lines");
    hf_svg_elevation *e = hf_calloc(nl, sizeof *e);
    hf_line_point **pts = hf_calloc(nl, sizeof *pts);
    hf_svg_section **secs = hf_calloc(nl, sizeof *secs);
    const char **names = hf_calloc(nl, sizeof *names);
    hf_status s = e && pts && secs && names
                      ? HF_OK
                      : hf_error_set(err, HF_ENOMEM, "overlay figure: out of memory");
    for (size_t i = 0; i < nl && s == HF_OK; i++) {
        if ((r->broken && r->broken[i]) || r->states[i].status != HF_OK)
            continue; /* a broken or unsolved line is not drawn */
        s = elevation_data(m, i, &r->states[i], &e[n], &pts[n], &secs[n], err);
        names[n++] = m->lines[i].name;
    }
    if (s == HF_OK && n == 0)
        s = hf_error_set(err, HF_EINVAL, "overlay figure: no solved lines");
    if (s == HF_OK)
        s = hf_svg_figure_elevation_overlay(out, "All lines in their own vertical planes", e, names,
                                            n, standalone, err);
    for (size_t i = 0; pts && secs && i < nl; i++) {
        hf_free(pts[i]);
        hf_free(secs[i]);
    }
    hf_free(e);
    hf_free(pts);
    hf_free(secs);
    hf_free(names);
    return s;
}

/* Two lengths (m) or forces (N) of two lines are the same: within 1e-9 of
 * the larger (values parsed from the same text are equal exactly). */
static int same_value(double a, double b)
{
    return fabs(a - b) <= 1e-9 * fmax(fabs(a), fabs(b));
}

/* 1 when lines i and j have the same make-up (pieces in order: the same
 * component and length, the same clump or buoy load) and the same geometry
 * at pose p up to a rotation about the vertical (horizontal anchor-fairlead
 * distance and fairlead height). */
static int same_line(const hf_model *m, size_t i, size_t j, const hf_pose *p)
{
    const hf_model_line *a = &m->lines[i], *b = &m->lines[j];
    if (a->npieces != b->npieces)
        return 0;
    for (size_t k = 0; k < a->npieces; k++) {
        const hf_piece *x = &a->pieces[k], *y = &b->pieces[k];
        if (x->kind != y->kind || x->component != y->component ||
            !same_value(x->length, y->length) || !same_value(x->load, y->load) ||
            !same_value(x->friction, y->friction))
            return 0;
    }
    hf_spread_geom ga, gb;
    if (hf_spread_line_geometry(m, i, p, &ga, NULL) != HF_OK ||
        hf_spread_line_geometry(m, j, p, &gb, NULL) != HF_OK)
        return 0;
    return fabs(ga.x - gb.x) <= 1e-6 * fmax(1.0, ga.x) && fabs(ga.z - gb.z) <= 1e-6;
}

size_t hf_report_line_groups(const hf_model *m, const hf_pose *pose, size_t *group)
{
    hf_pose rest;
    if (!pose) {
        hf_spread_pose_rest(m, &rest);
        pose = &rest;
    }
    size_t n = 0;
    for (size_t i = 0; i < m->nlines; i++) {
        group[i] = i;
        for (size_t j = 0; j < i; j++)
            if (group[j] == j && same_line(m, j, i, pose)) {
                group[i] = j;
                break;
            }
        n += group[i] == i;
    }
    return n;
}

hf_status hf_report_svg_curve(FILE *out, const hf_model *m, const hf_analysis_curve *c,
                              const char *title, const char *label, int tension_limits,
                              int standalone, hf_error *err)
{
    size_t nl = m->nlines;
    const char **names = hf_malloc((nl ? nl : 1) * sizeof *names);
    double *lim = tension_limits ? hf_malloc((nl ? nl : 1) * sizeof *lim) : NULL;
    if (!names || (tension_limits && !lim)) {
        hf_free(names);
        hf_free(lim);
        return hf_error_set(err, HF_ENOMEM, "curve figure: out of memory");
    }
    for (size_t j = 0; j < nl; j++) {
        names[j] = m->lines[j].name;
        if (lim)
            lim[j] = hf_analysis_allowed_tension(m, j);
    }
    double f = hf_criteria_required(&m->criteria, 0);
    hf_svg_curve cv = {title,
                       c->n,
                       c->offset,
                       c->restoring,
                       c->stiffness,
                       nl,
                       names,
                       c->line_tension,
                       c->utilisation,
                       f > 0 ? 1.0 / f : 0.0,
                       f > 0 ? lim : NULL,
                       label};
    hf_status s = hf_svg_figure_curve(out, &cv, standalone, err);
    hf_free(names);
    hf_free(lim);
    return s;
}
