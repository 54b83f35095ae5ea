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
    "usage: holdfast balance CASE [--load NAME]... [--csv FILE|-]\n"
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
    "                W / V (pass/fail only against 1.0: the block holds); pile and\n"
    "                plate: load and angle reported, no check\n"
    "Loads are fixed in the global frame (they do not turn with the hull).  Offsets\n"
    "(surge, sway) are those of the reference point along global x and y from the\n"
    "rest position; yaw is the turn from the rest heading, counterclockwise.\n"
    "\n"
    "options:\n"
    "  --load NAME    analyse this load case only (repeat for several)\n"
    "  --csv FILE|-   write one CSV row per load case and condition (- = standard\n"
    "                 output; the readable report is then left out)\n"
    "  --help         show this text\n"
    "\n"
    "CSV columns: load, condition (intact or broken:<line>), status, surge_m, sway_m,\n"
    "yaw_deg, max_tension_kN, max_tension_line, max_utilisation, criterion, passed\n"
    "(1/0), Tmax_<line>_kN per line (the largest tension along the line, not the\n"
    "fairlead tension that T_<line>_kN means in curve and sweep CSVs; 0 when broken),\n"
    "then horizontal_m, max_utilisation_line, min_line_factor, required_line_factor,\n"
    "message.  See docs/criteria.md and docs/SAFETY.md.\n"
    "\n"
    "exit status: 0 every criterion passed, 1 a criterion failed, 2 bad input or\n"
    "usage, 3 an equilibrium could not be found (no equilibrium or numerical failure)\n";

static const char *verdict(int passed)
{
    return passed ? "PASS" : "FAIL";
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
    for (size_t i = 0; i < m->nlines; i++)
        if (m->lines[i].anchor_spec.kind == HF_ANCHOR_GRAVITY) {
            fprintf(out,
                    "  gravity blocks: pass/fail only against %.2f (the block holds under the "
                    "mean load); compare\n  the factors with the design factors of the "
                    "governing code\n",
                    HF_CRITERIA_GRAVITY_SLIDING);
            break;
        }
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
        fprintf(out, " (>= %.2f)  %s\n", a->required_sliding, verdict(a->passed));
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
    fprintf(out, "     verdict: %s (governing: %s)\n", verdict(r->passed), crit);
}

static void print_load(FILE *out, const hf_load *l, const double f[3])
{
    fprintf(out, "\n== load %s: resultant %.1f kN toward %.1f deg, yaw moment %.1f kN m\n", l->name,
            hypot(f[0], f[1]) / 1e3, atan2(f[1], f[0]) * RAD2DEG, f[2] / 1e3);
    if (l->force > 0.0)
        fprintf(out, "   direct force %.1f kN toward %.1f deg\n", l->force / 1e3,
                l->direction * RAD2DEG);
    for (size_t k = 0; k < l->ndrag; k++) {
        const hf_drag *d = &l->drag[k];
        double q = 0.0;
        (void)hf_drag_force(d, &q, NULL, NULL, NULL); /* the load was checked: valid */
        fprintf(out,
                "   drag 1/2 rho C A V^2 = 1/2 x %.4g x %.4g x %.4g m^2 x (%.4g m/s)^2 = "
                "%.1f kN toward %.1f deg\n",
                d->density, d->coefficient, d->area, d->speed, q / 1e3, d->direction * RAD2DEG);
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
} sink_ctx;

static hf_status on_load(void *ctx, const hf_load *l, const double force[3], hf_error *err)
{
    sink_ctx *c = ctx;
    (void)err;
    if (c->out)
        print_load(c->out, l, force);
    return HF_OK;
}

static hf_status on_condition(void *ctx, const hf_load *l, const hf_balance_result *r,
                              hf_error *err)
{
    sink_ctx *c = ctx;
    (void)err;
    if (c->out)
        print_condition(c->out, c->m, r);
    if (c->f)
        c->nonfinite += hf_results_balance_row_write(hf_outfile_stream(c->f), c->m, l, r);
    return HF_OK;
}

static hf_status on_load_end(void *ctx, const hf_load *l, hf_status intact, const double offset[3],
                             hf_error *err)
{
    sink_ctx *c = ctx;
    (void)l, (void)intact, (void)offset, (void)err;
    if (c->out)
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

/* Runs the chosen load cases and writes them; returns the exit status. */
static int balance(const hf_model *m, const char *path, const char *csv, const size_t *which,
                   size_t nwhich)
{
    hf_error err;
    hf_error_clear(&err);
    int human = !csv || strcmp(csv, "-") != 0;
    sink_ctx c = {m, human ? stdout : NULL, NULL, 0, {0.0, 0.0, 0}, 0};
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
    hf_analysis_balance_sink sink = {&c, on_load, on_condition, on_load_end, on_progress};
    hf_analysis_balance_count n;
    hf_status st = hf_analysis_balance_run(m, which, nwhich, &sink, &n, &err);
    hf_cli_bar_clear(&c.progress);
    if (st != HF_OK) {
        hf_outfile_abort(c.f);
        return hf_cli_fail(&err);
    }
    if (csv && hf_cli_csv_end("balance", &c.f, c.nonfinite, &err) != HF_OK)
        return hf_cli_fail(&err);
    FILE *sum = human ? stdout : stderr;
    fprintf(sum, "\nbalance: %zu of %zu load-case conditions passed every criterion%s\n", n.passed,
            n.conditions, n.noresult ? "; some found no equilibrium (see above)" : "");
    if (!human)
        fputs(hf_caution_text, stderr);
    return n.noresult ? HF_EXIT_NUMERIC : n.failed ? HF_EXIT_CRITERION : HF_EXIT_OK;
}

int hf_cmd_balance(int argc, char **argv)
{
    const char *cmd = "balance", *path = NULL, *csv = NULL;
    const char *names[HF_CLI_MAX_REPEAT];
    int nsel = 0;
    const hf_cli_opt opts[] = {HF_CLI_OPT_CSV(&csv),
                               {.name = "--load",
                                .missing = "--load needs the NAME of a load case",
                                .nonempty = 1,
                                .count = &nsel,
                                .list = names,
                                .list_cap = HF_CLI_MAX_REPEAT}};
    int rc = hf_cli_parse_case_args(argc, argv, cmd, usage_text, opts, 2, &path);
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
    if (m.nloads == 0) {
        hf_error_set(&err, HF_EINVAL, "%s: no load cases: add a loads: list to the case file",
                     path);
        rc = hf_cli_fail(&err);
    } else if (!(which = hf_calloc(m.nloads, sizeof *which))) {
        rc = hf_cli_fail_status(HF_ENOMEM, "out of memory");
    } else if ((rc = pick_loads(&m, path, names, nsel, which, &nwhich)) == HF_CLI_CONTINUE) {
        rc = balance(&m, path, csv, which, nwhich);
    }
    hf_free(which);
    hf_model_free(&m);
    return rc;
}
