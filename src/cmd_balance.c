/* cmd_balance.c - 'holdfast balance': mean position per load, intact and broken, with criteria. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>
#include "holdfast/alloc.h"
#include "holdfast/analysis.h"
#include "holdfast/balance.h"
#include "holdfast/cli.h"
#include "holdfast/criteria.h"
#include "holdfast/outfile.h"
#include "holdfast/results.h"

#define RAD2DEG (180.0 / M_PI)

static const char usage_text[] =
    "usage: holdfast balance CASE [--load NAME]... [--water-level LEVELS] [--csv FILE|-]\n"
    "\n"
    "For each load case of the case file's loads: list (or each NAME given),\n"
    "finds the mean position of the hull where the mooring balances the load in\n"
    "surge, sway and yaw (heave, roll and pitch held at rest), first with every\n"
    "line intact, then with each line broken in turn, and checks the criteria:\n"
    "  line factor   MBL/T of each line's most loaded section against the intact\n"
    "                or one-line-broken factor of the criteria: section\n"
    "  offset        horizontal offset against criteria.max_offset\n"
    "  anchors       drag: uplift angle within the line's max_uplift (default 0);\n"
    "                gravity block: factors against sliding mu (W - V) / H and uplift\n"
    "                W / V against the required factors (criteria: or the line's\n"
    "                block_sliding_factor, block_uplift_factor; default 1.0: the block\n"
    "                holds); pile and plate: load and angle reported, no check.\n"
    "                criteria.anchor_line_friction: ignore takes anchor loads without\n"
    "                the grounded line's seabed friction (conservative)\n"
    "  overload      a line at or beyond a section's MBL fails its condition and\n"
    "                governs (criterion overload:<line>, alert overloaded)\n"
    "Every load case and condition is run at every still water level of the\n"
    "envelope: the case's site.water_levels ([low, high]: every 0.1 m and high;\n"
    "or a list), else site.water_level alone.  The summary gives per line the\n"
    "worst tension and anchor factors with the load, condition and level.\n"
    "Loads are fixed in the global frame (they do not turn with the hull).  Offsets\n"
    "(surge, sway) are those of the reference point along global x and y from the\n"
    "rest position; yaw is the turn from the rest heading, counterclockwise.\n"
    "\n"
    "options:\n"
    "  --load NAME    analyse this load case only (repeat for several)\n"
    "  --water-level LEVELS  the still water levels instead of the case's:\n"
    "                 FROM:TO:STEP (m; TO always included) or a list A,B,C\n"
    "  --csv FILE|-   write one CSV row per load case and condition (- = standard\n"
    "                 output; the readable report is then left out)\n"
    "  --help         show this text\n"
    "\n"
    "CSV columns: load, condition (intact or broken:<line>), water_level_m, status,\n"
    "surge_m, sway_m, yaw_deg, max_tension_kN, max_tension_line, max_utilisation,\n"
    "criterion, passed (1/0), Tmax_<line>_kN per line (the largest tension along the\n"
    "line, not the fairlead tension that T_<line>_kN means in curve and sweep CSVs;\n"
    "0 when broken), per line anchor_load_<line>_kN, angle_<line>_deg (uplift angle),\n"
    "sliding_<line>, uplift_<line> (gravity-block factors), then horizontal_m,\n"
    "max_utilisation_line, min_line_factor, required_line_factor, message, alert\n"
    "('overloaded' or empty).  See docs/criteria.md and docs/SAFETY.md.\n"
    "\n"
    "exit status: 0 every criterion passed, 1 a criterion failed or a line is\n"
    "overloaded (stderr names it), 2 bad input or usage, 3 an equilibrium could not\n"
    "be found (no equilibrium or numerical failure)\n";

static const char *verdict(int passed)
{
    return passed ? "PASS" : "FAIL";
}

/* The anchor part of the criteria: required block factors, friction choice. */
static void print_anchor_criteria(FILE *out, const hf_model *m)
{
    const hf_criteria *c = &m->criteria;
    for (size_t i = 0; i < m->nlines; i++)
        if (m->lines[i].anchor_spec.kind == HF_ANCHOR_GRAVITY) {
            double rs, ru;
            hf_criteria_block_required(c, &(hf_anchor){0}, &rs, &ru);
            fprintf(out,
                    "  gravity blocks: sliding factor >= %.2f, uplift factor >= %.2f%s%s; "
                    "compare\n  the factors with the design factors of the governing code\n",
                    rs, ru, rs == 1.0 && ru == 1.0 ? " (the block holds under the mean load)" : "",
                    c->block_sliding > 0 || c->block_uplift > 0 ? " (criteria)" : "");
            break;
        }
    for (size_t i = 0; i < m->nlines; i++) {
        const hf_anchor *a = &m->lines[i].anchor_spec;
        if (a->kind == HF_ANCHOR_GRAVITY && (a->required_sliding > 0 || a->required_uplift > 0)) {
            double rs, ru;
            hf_criteria_block_required(c, a, &rs, &ru);
            fprintf(out, "  line %s: block factors sliding >= %.2f, uplift >= %.2f (its own)\n",
                    m->lines[i].name, rs, ru);
        }
    }
    if (c->anchor_ignore_friction)
        fprintf(out, "  anchor loads: seabed friction of the grounded line ignored "
                     "(anchor_line_friction: ignore; conservative)\n");
}

static void print_criteria(FILE *out, const hf_model *m)
{
    const hf_criteria *c = &m->criteria;
    fprintf(out, "criteria: %s, %s analysis\n", c->preset ? c->preset : "user factors",
            c->analysis == HF_ANALYSIS_DYNAMIC ? "dynamic" : "quasi-static");
    if (c->factor_intact > 0.0)
        fprintf(out, "  line factor MBL/T >= %.3f intact\n", c->factor_intact);
    else
        fprintf(out, "  no intact line factor (not checked)\n");
    if (c->factor_damaged > 0.0)
        fprintf(out, "  line factor MBL/T >= %.3f with one line broken\n", c->factor_damaged);
    else
        fprintf(out, "  no one-line-broken factor (not checked)\n");
    const hf_criteria_preset *p = hf_criteria_preset_find(c->preset);
    if (p) {
        int dyn = c->analysis == HF_ANALYSIS_DYNAMIC;
        double pi = dyn ? p->intact_dyn : p->intact_qs, pd = dyn ? p->damaged_dyn : p->damaged_qs;
        if (c->factor_intact != pi || c->factor_damaged != pd)
            fprintf(out, "  (the case file overrides the preset's %.3f / %.3f)\n", pi, pd);
        if (p->capacity > 0.0)
            fprintf(out,
                    "  partial factors: mean %.2f, dynamic %.2f (one line broken %.2f, %.2f), "
                    "capacity %.2f MBL; whole tension taken as dynamic\n",
                    p->gamma_mean, p->gamma_dyn, p->gamma_mean_als, p->gamma_dyn_als, p->capacity);
    }
    if (c->source)
        fprintf(out, "  source: %s\n", c->source);
    if (c->max_offset > 0.0)
        fprintf(out, "  offset limit %.3f m\n", c->max_offset);
    else
        fprintf(out, "  no offset limit (not checked)\n");
    print_anchor_criteria(out, m);
}

static void print_anchor(FILE *out, const hf_model *m, size_t i, const hf_anchor_criterion *a)
{
    fprintf(out, "    %-18s %-8s %10.1f %10.1f %8.2f  ", hf_results_line_name(m, i),
            hf_criteria_anchor_kind_name(a->kind), a->h / 1e3, a->v / 1e3, a->angle * RAD2DEG);
    switch (a->kind) {
    case HF_ANCHOR_DRAG:
        fprintf(out, "uplift %.2f deg, allowed %.2f  %s\n", a->angle * RAD2DEG,
                a->max_angle * RAD2DEG, verdict(a->passed));
        break;
    case HF_ANCHOR_GRAVITY:
        if (a->has_sliding)
            fprintf(out, "sliding %.3f", a->sliding_factor);
        else
            fprintf(out, "sliding -");
        if (a->has_uplift)
            fprintf(out, ", uplift %.3f", a->uplift_factor);
        else
            fprintf(out, ", uplift -");
        fprintf(out, " (>= %.2f, %.2f)  %s\n", a->required_sliding, a->required_uplift,
                verdict(a->passed));
        break;
    default:
        fprintf(out, "load %.1f kN, reported only\n", a->load / 1e3);
        break;
    }
}

static void print_condition(FILE *out, const hf_model *m, const hf_balance_result *r)
{
    char cn[HF_MODEL_MAX_NAME + 16], crit[HF_MODEL_MAX_NAME + 32];
    hf_results_balance_condition(m, r, cn, sizeof cn);
    if (r->status != HF_OK) {
        fprintf(out, "\n  -- %s: NO RESULT (%s)\n     %s\n     verdict: FAIL\n", cn,
                hf_status_str(r->status), r->message);
        return;
    }
    fprintf(out, "\n  -- %s: equilibrium found (%d load steps, %d Newton iterations)\n", cn,
            r->steps, r->iterations);
    if (r->overloaded)
        fprintf(out,
                "     OVERLOADED: line %s at utilisation %.3f (tension at or beyond its MBL)\n",
                hf_results_line_name(m, r->overloaded_line), r->utilisation[r->overloaded_line]);
    fprintf(out, "     offset: surge %.3f m, sway %.3f m (horizontal %.3f m), yaw %.3f deg\n",
            r->offset[0], r->offset[1], r->horizontal, r->offset[2] * RAD2DEG);
    fprintf(out, "     residual: %.3g N, %.3g N, %.3g N m\n", r->residual[0], r->residual[1],
            r->residual[2]);
    fprintf(out, "    %-18s %12s %11s %8s %8s  %s\n", "line", "tension kN", "utilisation", "MBL/T",
            "needed", "line factor");
    for (size_t i = 0; i < r->nlines; i++) {
        const hf_line_criterion *l = &r->line[i];
        if (r->broken == i) {
            fprintf(out, "    %-18s %12s %11s %8s %8s  broken\n", hf_results_line_name(m, i), "-",
                    "-", "-", "-");
            continue;
        }
        char fac[32], req[32];
        if (l->has_factor)
            snprintf(fac, sizeof fac, "%.3f", l->factor);
        else
            snprintf(fac, sizeof fac, "-");
        if (l->checked)
            snprintf(req, sizeof req, "%.3f", l->required);
        else
            snprintf(req, sizeof req, "-");
        fprintf(out, "    %-18s %12.1f %11.4f %8s %8s  %s\n", hf_results_line_name(m, i),
                r->tension[i] / 1e3, r->utilisation[i], fac, req,
                l->checked ? verdict(l->passed) : "not checked");
    }
    fprintf(out, "    %-18s %-8s %10s %10s %8s  %s\n", "anchor", "kind", "H kN", "V kN", "angle",
            "check");
    for (size_t i = 0; i < r->nlines; i++)
        if (r->broken != i)
            print_anchor(out, m, i, &r->anchor[i]);
    if (r->offset_checked)
        fprintf(out, "     offset limit: %.3f m against %.3f m  %s\n", r->horizontal,
                m->criteria.max_offset, verdict(r->offset_passed));
    if (r->max_utilisation_line != HF_BALANCE_NONE)
        fprintf(out, "     worst line: %s, %.1f kN, utilisation %.4f\n",
                hf_results_line_name(m, r->max_utilisation_line),
                r->tension[r->max_utilisation_line] / 1e3, r->max_utilisation);
    hf_results_balance_criterion(m, r, crit, sizeof crit);
    char why[160];
    hf_results_balance_failure(m, r, why, sizeof why);
    fprintf(out, "     verdict: %s (governing: %s%s%s)\n", verdict(r->passed), crit,
            why[0] ? "; " : "", why);
}

/* A direction in the one convention of every output: degrees in [0, 360),
 * counter-clockwise from global x (issue 13; + 0.0 turns -0 into 0). */
static double deg360(double rad)
{
    double d = fmod(rad * RAD2DEG, 360.0);
    return d < 0.0 ? d + 360.0 : d + 0.0;
}

static void print_load(FILE *out, const hf_load *l, const double f[3])
{
    fprintf(out, "\n== load %s: resultant %.1f kN toward %.1f deg, yaw moment %.1f kN m\n", l->name,
            hypot(f[0], f[1]) / 1e3, deg360(atan2(f[1], f[0])), f[2] / 1e3);
    if (l->force > 0.0)
        fprintf(out, "   direct force %.1f kN toward %.1f deg\n", l->force / 1e3,
                deg360(l->direction));
    for (size_t k = 0; k < l->ndrag; k++) {
        const hf_drag *d = &l->drag[k];
        double q = 0.0;
        (void)hf_drag_force(d, &q, NULL, NULL, NULL); /* the load was checked: valid */
        fprintf(out,
                "   drag 1/2 rho C A V^2 = 1/2 x %.4g x %.4g x %.4g m^2 x (%.4g m/s)^2 = "
                "%.1f kN toward %.1f deg\n",
                d->density, d->coefficient, d->area, d->speed, q / 1e3, deg360(d->direction));
    }
    fprintf(out, "   (loads are fixed in the global frame)\n");
}

/* Progress on a terminal (the shared bar of cli.h, counted in conditions):
 * shown when standard error is a terminal and standard output is not (when
 * the report goes to the terminal, its lines are the progress). */

/* What the balance command writes as results arrive. */
typedef struct {
    const hf_model *m;
    FILE *out;     /* the readable report, or NULL */
    hf_outfile *f; /* the CSV, or NULL */
    size_t nonfinite;
    hf_cli_bar progress;
    int show_progress;
    size_t nlevels; /* levels of the envelope */
    int full;       /* 1: this level is reported in full (the one nearest the
                     * case's water_level); other levels: one line per passing
                     * condition, failures in full */
    double nearest; /* that level, m */
} sink_ctx;

static hf_status on_load(void *ctx, const hf_load *l, const double force[3], hf_error *err)
{
    sink_ctx *c = ctx;
    (void)err;
    if (c->out && c->full)
        print_load(c->out, l, force);
    else if (c->out)
        fprintf(c->out, "\n== load %s\n", l->name);
    return HF_OK;
}

/* One line for a condition that passed at a level other than the detailed one. */
static void print_brief(FILE *out, const hf_model *m, const hf_balance_result *r)
{
    char cn[HF_MODEL_MAX_NAME + 16], crit[HF_MODEL_MAX_NAME + 32];
    hf_results_balance_condition(m, r, cn, sizeof cn);
    hf_results_balance_criterion(m, r, crit, sizeof crit);
    fprintf(out,
            "  -- %s: PASS; worst %s %.1f kN (utilisation %.4f), offset %.3f m, governing %s\n", cn,
            hf_results_line_name(m, r->max_utilisation_line),
            r->max_utilisation_line < r->nlines ? r->tension[r->max_utilisation_line] / 1e3 : 0.0,
            r->max_utilisation, r->horizontal, crit);
}

static hf_status on_condition(void *ctx, const hf_load *l, const hf_balance_result *r,
                              hf_error *err)
{
    sink_ctx *c = ctx;
    (void)err;
    if (c->out && (c->full || !r->passed || r->status != HF_OK))
        print_condition(c->out, c->m, r);
    else if (c->out)
        print_brief(c->out, c->m, r);
    if (c->f)
        c->nonfinite += hf_results_balance_row_write(hf_outfile_stream(c->f), c->m, l, r);
    return HF_OK;
}

static hf_status on_load_end(void *ctx, const hf_load *l, hf_status intact, const double offset[3],
                             hf_error *err)
{
    sink_ctx *c = ctx;
    (void)l, (void)intact, (void)offset, (void)err;
    if (c->out && c->full)
        fprintf(c->out, "\n%s", hf_caution_text);
    return HF_OK;
}

static void on_progress(void *ctx, size_t done, size_t total)
{
    sink_ctx *c = ctx;
    if (c->show_progress)
        hf_cli_bar_draw(&c->progress, done, total, "conditions");
}

/* The load cases named by --load (in case-file order, each once) into
 * which[], *n of them; all when none is named.  Returns HF_CLI_CONTINUE or
 * the exit status after a message. */
static int pick_loads(const hf_model *m, const char *path, const char *const *names, int nnames,
                      size_t *which, size_t *n)
{
    unsigned char *pick = hf_calloc(m->nloads, 1);
    if (!pick)
        return hf_cli_fail_status(HF_ENOMEM, "out of memory");
    for (int j = 0; j < nnames; j++) {
        size_t k = hf_model_load_find(m, names[j]);
        if (k == (size_t)-1) {
            const char *near = hf_cli_suggest_model(m, 1, names[j]);
            fprintf(stderr, "holdfast balance: --load: no load case named \"%s\" in %s", names[j],
                    path);
            if (near)
                fprintf(stderr, " (did you mean \"%s\"?)", near);
            fprintf(stderr, "; the load cases are:");
            for (size_t i = 0; i < m->nloads; i++)
                fprintf(stderr, "%s %s", i ? "," : "", m->loads[i].name);
            fputc('\n', stderr);
            hf_free(pick);
            return HF_EXIT_USAGE;
        }
        pick[k] = 1;
    }
    *n = 0;
    for (size_t k = 0; k < m->nloads; k++)
        if (nnames == 0 || pick[k])
            which[(*n)++] = k;
    hf_free(pick);
    return HF_CLI_CONTINUE;
}

/* The next still water level of the envelope (human report only). */
static hf_status on_level(void *ctx, size_t k, double level, const hf_model *at, hf_error *err)
{
    sink_ctx *c = ctx;
    (void)err;
    c->m = at; /* rows and names from the model at this level (same names) */
    c->full = c->nlevels == 1 || level == c->nearest;
    if (c->out && c->nlevels > 1)
        fprintf(c->out, "\n=== still water level %.3g m above the datum (%zu of %zu)%s\n", level,
                k + 1, c->nlevels,
                c->full ? "" : ": conditions that pass in one line each, failures in full");
    return HF_OK;
}

/* One line on stderr naming the worst overload of e; HF_EXIT_CRITERION, or
 * HF_EXIT_OK when nothing is overloaded. */
static int report_overload(const hf_model *m, const hf_analysis_envelope *e)
{
    if (!e->overloaded)
        return HF_EXIT_OK;
    char w[2 * HF_MODEL_MAX_NAME + 64];
    hf_results_where(m, &e->overload_at, w, sizeof w);
    fprintf(stderr,
            "holdfast balance: line %s is overloaded: utilisation %.3f (T %.1f kN at or beyond "
            "its MBL) under %s; %zu condition%s with an overloaded line\n",
            hf_results_line_name(m, e->overload_line), e->overload_utilisation,
            e->overload_tension / 1e3, w, e->overloaded, e->overloaded == 1 ? "" : "s");
    return HF_EXIT_CRITERION;
}

/* The closing summary and verdict over the envelope, to sum. */
static void print_verdict(FILE *sum, const hf_model *m, const hf_analysis_envelope *e)
{
    const hf_analysis_balance_count *n = &e->count;
    char scope[512];
    hf_results_envelope_scope(m, e, scope, sizeof scope);
    hf_results_envelope_summary_write(sum, m, e);
    fprintf(sum, "\nbalance: %zu of %zu load-case conditions passed every criterion%s\n", n->passed,
            n->conditions, n->noresult ? "; some found no equilibrium (see above)" : "");
    if (n->failed) {
        char w[2 * HF_MODEL_MAX_NAME + 64];
        hf_results_where(m, &e->first_failed, w, sizeof w);
        fprintf(sum, "verdict: FAIL over %s (first failure: %s)\n", scope, w);
    } else {
        fprintf(sum, "verdict: PASS over %s\n", scope);
    }
}

/* Runs the chosen load cases at every level and writes them; returns the exit status. */
static int balance(const hf_model *m, const char *path, const char *csv, const size_t *which,
                   size_t nwhich, hf_analysis_envelope *e)
{
    hf_error err;
    hf_error_clear(&err);
    int human = !csv || strcmp(csv, "-") != 0;
    sink_ctx c = {m, human ? stdout : NULL, NULL, 0, {0.0, 0.0, 0}, 0, e->nlevels, 1, e->level[0]};
    for (size_t k = 1; k < e->nlevels; k++) /* the level shown in full */
        if (fabs(e->level[k] - m->site.water_level) < fabs(c.nearest - m->site.water_level))
            c.nearest = e->level[k];
    hf_cli_bar_start(&c.progress);
    c.show_progress = isatty(fileno(stderr)) && !isatty(fileno(stdout));
    if (csv && !(c.f = hf_cli_csv_begin(csv, hf_results_balance_header_write, m, &err)))
        return hf_cli_fail(&err);
    if (human) {
        fprintf(c.out, "holdfast balance: %s\n", m->title ? m->title : path);
        fprintf(c.out, "mean equilibrium in surge, sway and yaw; heave, roll and pitch held at "
                       "rest; offsets from the rest pose\n");
        print_criteria(c.out, m);
    }
    hf_analysis_envelope_sink sink = {{&c, on_load, on_condition, on_load_end, on_progress},
                                      on_level};
    hf_status st = hf_analysis_envelope_run(e, m, which, nwhich, &sink, &err);
    hf_cli_bar_clear(&c.progress);
    if (st != HF_OK) {
        hf_outfile_abort(c.f);
        return hf_cli_fail(&err);
    }
    if (csv && hf_cli_csv_end("balance", &c.f, c.nonfinite, &err) != HF_OK)
        return hf_cli_fail(&err);
    FILE *sum = human ? stdout : stderr;
    print_verdict(sum, m, e);
    if (!human || e->nlevels > 1)
        fprintf(sum, "%s%s", human ? "\n" : "", hf_caution_text);
    int over = report_overload(m, e);
    const hf_analysis_balance_count *n = &e->count;
    return n->noresult ? HF_EXIT_NUMERIC : n->failed || over ? HF_EXIT_CRITERION : HF_EXIT_OK;
}

/* The levels of --water-level (FROM:TO:STEP, TO always included, or A,B,C)
 * or of the case into a new envelope *e.  Returns HF_CLI_CONTINUE or the
 * exit status after a message. */
static int levels(const hf_model *m, const char *text, hf_analysis_envelope **e)
{
    double v[HF_MODEL_MAX_LEVELS];
    size_t n = 0;
    hf_error err;
    hf_error_clear(&err);
    if (!text) {
        n = hf_analysis_envelope_levels(m, v, HF_MODEL_MAX_LEVELS);
    } else if (strchr(text, ':')) {
        double from, to, step;
        size_t count;
        if (hf_cli_parse_range(text, &from, &to, &step, HF_MODEL_MAX_LEVELS - 1, &count, &err) !=
            HF_OK)
            return hf_cli_usage_error("balance", "--water-level: %s", err.text);
        for (n = 0; n < count; n++) /* to 1e-9 m: 0.1 x 19 gives the double of "1.9" */
            v[n] = round((from + (double)n * step) * 1e9) / 1e9;
        if (fabs(v[n - 1] - to) > 1e-9 * fabs(step))
            v[n++] = to; /* an envelope always covers its end */
        else
            v[n - 1] = to;
    } else {
        char buf[4096];
        snprintf(buf, sizeof buf, "%s", text);
        for (char *save = NULL, *t = strtok_r(buf, ",", &save); t; t = strtok_r(NULL, ",", &save)) {
            if (n == HF_MODEL_MAX_LEVELS)
                return hf_cli_usage_error("balance", "--water-level: more than %d levels",
                                          HF_MODEL_MAX_LEVELS);
            if (hf_cli_parse_value("--water-level", t, HF_DIM_LENGTH, &v[n++], &err) != HF_OK)
                return hf_cli_usage_error("balance", "%s", err.text);
        }
        if (n == 0)
            return hf_cli_usage_error("balance",
                                      "--water-level: expected FROM:TO:STEP or a list "
                                      "of levels, got \"%s\"",
                                      text);
    }
    for (size_t k = 0; k < n; k++)
        if (!(m->site.depth + v[k] > 0.0))
            return hf_cli_usage_error("balance",
                                      "--water-level: %g m is not above the seabed (> -%g m)", v[k],
                                      m->site.depth);
    if (!(*e = hf_analysis_envelope_alloc(m, n, &err)))
        return hf_cli_fail(&err);
    memcpy((*e)->level, v, n * sizeof *v);
    return HF_CLI_CONTINUE;
}

int hf_cmd_balance(int argc, char **argv)
{
    const char *cmd = "balance", *path = NULL, *csv = NULL, *wl = NULL;
    const char *names[HF_CLI_MAX_REPEAT];
    int nsel = 0;
    const hf_cli_opt opts[] = {
        HF_CLI_OPT_CSV(&csv),
        {.name = "--load",
         .missing = "--load needs the NAME of a load case",
         .nonempty = 1,
         .count = &nsel,
         .list = names,
         .list_cap = HF_CLI_MAX_REPEAT},
        HF_CLI_OPT_VALUE("--water-level", "--water-level needs FROM:TO:STEP or a list A,B", &wl)};
    int rc = hf_cli_parse_case_args(argc, argv, cmd, usage_text, opts, 3, &path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_error err;
    hf_error_clear(&err);
    if (csv && hf_cli_check_output("--csv", csv, path, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    hf_model m;
    rc = hf_cli_case_load(path, &m);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    size_t *which = NULL, nwhich = 0;
    hf_analysis_envelope *env = NULL;
    if (m.nloads == 0) {
        hf_error_set(&err, HF_EINVAL, "%s: no load cases: add a loads: list to the case file",
                     path);
        rc = hf_cli_fail(&err);
    } else if (!(which = hf_calloc(m.nloads, sizeof *which))) {
        rc = hf_cli_fail_status(HF_ENOMEM, "out of memory");
    } else if ((rc = pick_loads(&m, path, names, nsel, which, &nwhich)) == HF_CLI_CONTINUE &&
               (rc = levels(&m, wl, &env)) == HF_CLI_CONTINUE) {
        rc = balance(&m, path, csv, which, nwhich, env);
    }
    hf_analysis_envelope_free(env);
    hf_free(which);
    hf_model_free(&m);
    return rc;
}
