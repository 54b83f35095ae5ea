/* cmd_design.c - 'holdfast design': the quasi-static design check of the
 * case's environments (design.h), intact and with each line broken: a
 * terminal motion budget per condition and a CSV (designcsv.h). */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/cli.h"
#include "holdfast/design.h"
#include "holdfast/designcsv.h"
#include "holdfast/outfile.h"

#define RAD2DEG (180.0 / M_PI)

static const char usage_text[] =
    "usage: holdfast design CASE [--environment NAME] [--csv FILE|-]\n"
    "\n"
    "The quasi-static design check of each environment of the case file's\n"
    "environments: list (or NAME only), intact and with each line broken in turn:\n"
    "  mean pose     wind, current and mean wave drift from the hull's tables at the\n"
    "                hull's heading, balanced by the mooring in surge, sway and yaw\n"
    "  motions       slow-drift (low-frequency: Newman's approximation, natural\n"
    "                periods from the mooring stiffness at the mean pose) and\n"
    "                wave-frequency (RAOs), significant (2 sigma) and most probable\n"
    "                maximum over the storm duration\n"
    "  design offset mean + the larger of (LF max + WF significant) and (LF\n"
    "                significant + WF max), along the mean offset\n"
    "  tensions      each line at both combination poses, the larger checked\n"
    "                against the criteria's quasi-static factors and offset limit\n"
    "Hull keys, environments and formulas: docs/design.md.\n"
    "\n"
    "options:\n"
    "  --environment NAME  check this environment only\n"
    "  --csv FILE|-        one CSV row per environment and condition (- = standard\n"
    "                      output; the readable budget is then left out)\n"
    "  --help              show this text\n"
    "\n"
    "CSV columns: environment, condition (intact or broken:<line>), status,\n"
    "mean_surge_m, mean_sway_m (global, from rest), mean_yaw_deg, lf_period_surge_s,\n"
    "lf_period_sway_s, lf_sig_surge_m, lf_max_surge_m, wf_sig_surge_m, wf_max_surge_m,\n"
    "lf_sig_sway_m, wf_sig_sway_m (hull axes), design_offset_m, max_tension_kN,\n"
    "max_tension_line, max_utilisation, passed (1/0), then yaw and sway motions,\n"
    "variances (full integral and white-noise), the combinations, tensions at the\n"
    "mean and both poses, mean loads, spectral energy outside the tables,\n"
    "max_utilisation_line, offset_passed, alert, message (docs/design.md).\n"
    "\n"
    "exit status: 0 every condition passed, 1 a condition failed a criterion or a\n"
    "line is overloaded (one line on stderr names the first), 2 bad input or usage,\n"
    "3 a condition has no result (no equilibrium, no stiffness, numerical failure)\n";

typedef struct {
    const hf_model *m;
    FILE *out;     /* the readable budget, or NULL */
    hf_outfile *f; /* the CSV, or NULL */
    size_t nonfinite, passed, failed, noresult;
    char first[HF_ERROR_TEXT]; /* first failure, for the one-line message */
} run_ctx;

static void print_env(FILE *out, const hf_designdata_env *de, const hf_design_result *r)
{
    const hf_environment *e = &de->env;
    fprintf(out, "\n== environment %s (storm duration %.2f h)\n", de->name, e->duration / 3600.0);
    if (e->has_wind)
        fprintf(out, "   wind %.2f m/s toward %.1f deg\n", e->wind.speed,
                e->wind.direction * RAD2DEG);
    if (e->has_current)
        fprintf(out, "   current %.2f m/s toward %.1f deg\n", e->current.speed,
                e->current.direction * RAD2DEG);
    if (!e->has_waves) {
        fprintf(out, "   no waves: no slow-drift or wave-frequency motion\n");
        return;
    }
    const hf_spectrum *s = &r->motion.spectrum;
    fprintf(out,
            "   waves JONSWAP Hs %.2f m, Tp %.2f s, gamma %.2f toward %.1f deg; scale %.4f "
            "(m0 = Hs^2/16; closed form 1 - 0.287 ln gamma = %.4f)\n",
            e->waves.hs, e->waves.tp, e->waves.gamma, e->waves.direction * RAD2DEG, s->scale,
            s->scale_closed);
}

static void print_budget(FILE *out, const hf_model *m, const hf_design_result *r)
{
    char cn[HF_MODEL_MAX_NAME + 16];
    hf_design_condition_name(m, r, cn, sizeof cn);
    if (r->status != HF_OK) {
        fprintf(out, "\n  -- %s: NO RESULT (%s)\n     %s\n     verdict: FAIL\n", cn,
                hf_status_str(r->status), r->message);
        return;
    }
    const hf_env_design *g = &r->design;
    const hf_env_dof *d = r->motion.dof;
    fprintf(out, "\n  -- %s: mean pose after %d equilibria\n", cn, r->pose_iterations);
    fprintf(out, "     mean      %8.2f m toward %.1f deg, yaw %.2f deg (load %.1f kN, %.1f kN m)\n",
            g->mean, g->direction * RAD2DEG, r->mean_offset[2] * RAD2DEG,
            hypot(r->mean.total_global[0], r->mean.total_global[1]) / 1e3,
            r->mean.total_global[2] / 1e3);
    fprintf(out, "     T_n       surge %.1f s, sway %.1f s, yaw %.1f s\n", d[0].lf_period,
            d[1].lf_period, d[2].lf_period);
    fprintf(out, "     LF        sig %.2f m, max %.2f m along the mean offset\n", g->lf_sig,
            g->lf_max);
    fprintf(out,
            "               variance surge %.4g m^2, sway %.4g m^2 (white-noise approximation "
            "%.4g, %.4g)\n",
            d[0].lf_var, d[1].lf_var, d[0].lf_var_white, d[1].lf_var_white);
    fprintf(out, "     WF        sig %.2f m, max %.2f m along the mean offset\n", g->wf_sig,
            g->wf_max);
    fprintf(out, "     LFmax+WFsig %.2f m, LFsig+WFmax %.2f m\n", g->combo_lf_max, g->combo_wf_max);
    fprintf(out, "     design    %8.2f m, yaw %.2f deg", g->offset, g->yaw * RAD2DEG);
    if (r->offset_checked)
        fprintf(out, " (limit %.2f m: %s)", m->criteria.max_offset,
                r->offset_passed ? "PASS" : "FAIL");
    fputc('\n', out);
    if (r->max_utilisation_line < m->nlines) {
        size_t w = r->max_utilisation_line;
        const hf_line_criterion *l = &r->line[w];
        fprintf(out,
                "     worst     %s: %.0f kN at the mean -> %.0f kN at the design pose, "
                "utilisation %.3f, MBL/T %.2f (needed %.2f)%s\n",
                m->lines[w].name, r->tension_mean[w] / 1e3, r->tension[w] / 1e3, r->utilisation[w],
                l->factor, l->required, r->overloaded ? " OVERLOADED" : "");
    }
    fprintf(out, "     verdict: %s\n", r->passed ? "PASS" : "FAIL");
}

/* One line on why condition r failed: the first failed check. */
static void failure(const hf_model *m, const hf_design_result *r, const char *env, const char *cn,
                    char *buf, size_t cap)
{
    size_t w = r->max_utilisation_line < m->nlines ? r->max_utilisation_line : 0;
    const char *line = m->nlines ? m->lines[w].name : "?";
    if (r->overloaded)
        snprintf(buf, cap,
                 "environment %s, %s: line %s is overloaded at the design pose: utilisation %.3f "
                 "(%.0f kN), design offset %.2f m",
                 env, cn, line, r->max_utilisation, r->tension[w] / 1e3, r->design.offset);
    else if (!r->lines_passed)
        snprintf(buf, cap,
                 "environment %s, %s fails the line factor: line %s MBL/T %.3f below %.3f at the "
                 "design pose (%.0f kN, design offset %.2f m)",
                 env, cn, line, r->line[w].factor, r->line[w].required, r->tension[w] / 1e3,
                 r->design.offset);
    else if (!r->offset_passed)
        snprintf(buf, cap,
                 "environment %s, %s fails the offset limit: design offset %.2f m > %.2f m", env,
                 cn, r->design.offset, m->criteria.max_offset);
    else
        snprintf(buf, cap, "environment %s, %s fails an anchor check at the design pose", env, cn);
}

/* Counts and writes one solved condition. */
static void record(run_ctx *c, const hf_design_result *r)
{
    if (c->out)
        print_budget(c->out, c->m, r);
    if (c->f)
        c->nonfinite += hf_design_csv_row_write(hf_outfile_stream(c->f), c->m, r);
    char cn[HF_MODEL_MAX_NAME + 16];
    const char *env = c->m->design->env[r->env].name;
    hf_design_condition_name(c->m, r, cn, sizeof cn);
    if (r->status != HF_OK) {
        c->noresult++;
        if (!c->first[0])
            snprintf(c->first, sizeof c->first, "environment %s, %s: no result: %.900s", env, cn,
                     r->message);
    } else if (!r->passed) {
        c->failed++;
        if (!c->first[0])
            failure(c->m, r, env, cn, c->first, sizeof c->first);
    } else {
        c->passed++;
    }
}

static int run(const hf_model *m, size_t only, const char *csv)
{
    hf_error err;
    hf_error_clear(&err);
    hf_design *d = hf_design_alloc(m, &err);
    if (!d)
        return hf_cli_fail(&err);
    int human = !csv || strcmp(csv, "-") != 0;
    run_ctx c = {m, human ? stdout : NULL, NULL, 0, 0, 0, 0, ""};
    if (csv && !(c.f = hf_cli_csv_begin(csv, hf_design_csv_header_write, m, &err))) {
        hf_design_free(d);
        return hf_cli_fail(&err);
    }
    if (human)
        fprintf(c.out,
                "holdfast design: %s\nquasi-static design check (docs/design.md); offsets "
                "from the rest pose, motions along the mean offset\n",
                m->title ? m->title : m->source_path);
    for (size_t e = 0; e < hf_design_nenv(d); e++) {
        if (only != (size_t)-1 && e != only)
            continue;
        for (size_t k = 0; k < hf_design_ncond(d); k++) {
            hf_design_solve(d, e, k, &err); /* the result carries any failure */
            const hf_design_result *r = hf_design_result_get(d);
            if (k == 0 && c.out)
                print_env(c.out, &m->design->env[e], r);
            record(&c, r);
        }
    }
    hf_design_free(d);
    if (csv && hf_cli_csv_end("design", &c.f, c.nonfinite, &err) != HF_OK)
        return hf_cli_fail(&err);
    FILE *sum = human ? stdout : stderr;
    fprintf(sum, "\ndesign: %zu of %zu conditions passed\n", c.passed,
            c.passed + c.failed + c.noresult);
    fprintf(sum, "\n%s%s", hf_caution_text, hf_design_caution_text);
    if (c.first[0])
        fprintf(stderr, "holdfast design: %s\n", c.first);
    return c.noresult ? HF_EXIT_NUMERIC : c.failed ? HF_EXIT_CRITERION : HF_EXIT_OK;
}

int hf_cmd_design(int argc, char **argv)
{
    const char *cmd = "design", *path = NULL, *csv = NULL, *env = NULL;
    const hf_cli_opt opts[] = {HF_CLI_OPT_CSV(&csv),
                               {.name = "--environment",
                                .missing = "--environment needs the NAME of an environment",
                                .nonempty = 1,
                                .value = &env}};
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
    size_t only = (size_t)-1;
    if (env && (only = hf_designdata_env_find(m.design, env)) == (size_t)-1) {
        fprintf(stderr, "holdfast design: --environment: no environment named \"%s\" in %s", env,
                path);
        for (size_t i = 0; m.design && i < m.design->nenv; i++)
            fprintf(stderr, "%s %s", i ? "," : "; the environments are:", m.design->env[i].name);
        fputc('\n', stderr);
        rc = HF_EXIT_USAGE;
    } else {
        rc = run(&m, only, csv);
    }
    hf_model_free(&m);
    return rc;
}

/* ---- for `holdfast check` ---- */

static void check_tables(const hf_designdata *d)
{
    printf("\nhull for the design method: mass %.6g t (added %.6g t surge, %.6g t sway), yaw "
           "inertia %.4g t m^2 (added %.4g), damping %.3g/%.3g/%.3g %% of critical\n",
           d->mass / 1e3, d->added_mass[0] / 1e3, d->added_mass[1] / 1e3, d->yaw_inertia / 1e3,
           d->added_yaw_inertia / 1e3, 100 * d->damping[0], 100 * d->damping[1],
           100 * d->damping[2]);
    printf("  areas: wind %.4g m^2, current %.4g m^2; length %.4g m\n", d->wind_area,
           d->current_area, d->length);
    for (int i = 0; i < HF_DD_NTABLES; i++) {
        const hf_table *t = d->table[i];
        if (!t)
            continue;
        double lo, hi;
        hf_table_freq_range(t, &lo, &hi);
        printf("  %-21s %s: ", hf_designdata_table_key(i), d->path[i]);
        if (hf_table_nfreq(t))
            printf("%zu frequencies %.3g to %.3g rad/s, ", hf_table_nfreq(t), lo, hi);
        printf("%zu headings (largest gap %.1f deg)\n", hf_table_nheading(t),
               hf_table_heading_gap_max(t) * RAD2DEG);
    }
}

void hf_cmd_design_check_print(const hf_model *m)
{
    const hf_designdata *d = m->design;
    if (!d)
        return;
    check_tables(d);
    printf("\nenvironments (%zu; directions toward; coverage at the rest heading):\n", d->nenv);
    hf_error err;
    hf_env_workspace *ws = d->nenv ? hf_env_workspace_alloc(&err) : NULL;
    hf_env_hull h;
    hf_designdata_hull(d, m->site.water_density, &h);
    for (size_t i = 0; i < d->nenv; i++) {
        const hf_environment *e = &d->env[i].env;
        printf("  %-20s", d->env[i].name);
        if (e->has_wind)
            printf(" wind %.3g m/s toward %.1f deg;", e->wind.speed, e->wind.direction * RAD2DEG);
        if (e->has_current)
            printf(" current %.3g m/s toward %.1f deg;", e->current.speed,
                   e->current.direction * RAD2DEG);
        if (e->has_waves)
            printf(" waves Hs %.3g m, Tp %.3g s, gamma %.3g toward %.1f deg;", e->waves.hs,
                   e->waves.tp, e->waves.gamma, e->waves.direction * RAD2DEG);
        printf(" %.3g h\n", e->duration / 3600.0);
        double out[2];
        if (ws && e->has_waves && hf_env_check(&h, e, m->hull.heading, ws, out, &err) == HF_OK)
            printf("  %-20s spectral energy outside the tables: RAOs %.3g %%, drift %.3g %% "
                   "(at most %.3g %%)\n",
                   "", 100 * out[0], 100 * out[1], 100 * HF_ENV_OUTSIDE_MAX);
    }
    hf_env_workspace_free(ws);
}
