/* report_design.c - the design check (issue 14) in the HTML report: the
 * hull's design data and environments in the Case section, and a
 * `kind: design` study of `holdfast run` (CSV, checks, spectrum figure,
 * motion-budget figure, tensions table).  See report_design.h and
 * docs/design.md. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/designcsv.h"
#include "holdfast/designdata.h"
#include "holdfast/report_design.h"
#include "holdfast/svg.h"

#define RAD2DEG (180.0 / M_PI)
#define NSPEC 241 /* points of the spectrum curve */

static void num(char *buf, double v, int digits)
{
    hf_report_number(buf, 32, v, digits);
}

/* ---- figures ---- */

hf_status hf_report_svg_spectrum(FILE *out, const hf_spectrum *s, const char *title, size_t nranges,
                                 const double *lo, const double *hi, const char *const *names,
                                 int standalone, hf_error *err)
{
    double w0, w1, w[NSPEC], sv[NSPEC], smax = 0.0;
    hf_spectrum_band(s, 1e-3, &w0, &w1);
    for (size_t i = 0; i < NSPEC; i++) {
        w[i] = w0 + (w1 - w0) * (double)i / (NSPEC - 1);
        sv[i] = hf_spectrum_eval(s, w[i]);
        smax = sv[i] > smax ? sv[i] : smax;
    }
    hf_svg_axes a;
    const double W = 680.0, H = 330.0;
    hf_status st = hf_svg_axes_init(&a, 80, 50, W - 110, H - 110, w0, w1, 0.0, smax * 1.05, 0, err);
    if (st != HF_OK)
        return st;
    hf_svg_begin(out, W, H, title, standalone);
    hf_svg_axes_draw(out, &a, "angular frequency (rad/s)", "S (m\xc2\xb2 s/rad)", title);
    hf_svg_polyline(out, &a, w, 1, sv, 1, NSPEC, hf_svg_colour(0), 2.0, "");
    for (size_t k = 0; k < nranges; k++) { /* the tables' frequency ranges */
        double yk = a.top + 14.0 * (double)k + 12.0;
        double x0 = fmax(hf_svg_axes_px(&a, lo[k]), a.left);
        double x1 = fmin(hf_svg_axes_px(&a, hi[k]), a.left + a.width);
        if (!(x1 > x0))
            continue;
        fprintf(out,
                "<line x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" stroke=\"%s\" "
                "stroke-width=\"3\"/>\n",
                x0, yk, x1, yk, hf_svg_colour(k + 1));
        char lab[160];
        snprintf(lab, sizeof lab, "%s range", names[k]);
        hf_svg_text(out, x1 - 4, yk - 3, 'e', 11, 0, 0, lab);
    }
    hf_svg_end(out);
    return HF_OK;
}

/* Bars, labels and totals of the budget figure. */
static void budget_bars(FILE *out, const hf_svg_ticks *t, double left, double pw, double top,
                        double row, size_t n, const char *const *labels, const double *part)
{
    for (size_t i = 0; i < n; i++) {
        double y = top + row * (double)i, x = 0.0;
        hf_svg_text(out, left - 8, y + row * 0.62, 'e', 12, 0, 0, labels[i]);
        for (int k = 0; k < 3; k++) {
            double v = part[i * 3 + k];
            double x0 = left + (x - t->lo) / (t->hi - t->lo) * pw;
            double x1 = left + (x + v - t->lo) / (t->hi - t->lo) * pw;
            fprintf(out,
                    "<rect x=\"%.2f\" y=\"%.2f\" width=\"%.2f\" height=\"%.2f\" fill=\"%s\"/>\n",
                    x0, y + 3, x1 - x0, row - 8, hf_svg_colour(k));
            x += v;
        }
        char buf[48];
        num(buf, x, 3);
        strcat(buf, " m");
        hf_svg_text(out, left + (x - t->lo) / (t->hi - t->lo) * pw + 5, y + row * 0.62, 's', 12, 1,
                    0, buf);
    }
}

hf_status hf_report_svg_budget(FILE *out, const char *title, size_t n, const char *const *labels,
                               const double *part, double limit, int standalone, hf_error *err)
{
    double top_v = limit > 0.0 ? limit : 0.0;
    if (n == 0)
        return hf_error_set(err, HF_EINVAL, "motion budget: no conditions");
    for (size_t i = 0; i < n; i++) {
        double s = 0.0;
        for (int k = 0; k < 3; k++) {
            if (!(part[i * 3 + k] >= 0.0) || !isfinite(part[i * 3 + k]))
                return hf_error_set(err, HF_EINVAL,
                                    "motion budget: expected finite parts >= 0 (condition %zu)", i);
            s += part[i * 3 + k];
        }
        top_v = s > top_v ? s : top_v;
    }
    hf_svg_ticks t;
    hf_status st = hf_svg_ticks_choose(0.0, top_v > 0.0 ? top_v * 1.05 : 1.0, 6, &t, err);
    if (st != HF_OK)
        return st;
    const double row = 24.0, left = 200.0, top = 56.0, W = 760.0, pw = W - left - 90.0;
    const double H = top + row * (double)n + 60.0, bottom = top + row * (double)n;
    hf_svg_begin(out, W, H, title, standalone);
    hf_svg_text(out, W / 2, 22, 'm', 15, 1, 0, title);
    for (size_t i = 0; i < t.n; i++) { /* grid and tick labels */
        double v = hf_svg_tick_value(&t, i), x = left + (v - t.lo) / (t.hi - t.lo) * pw;
        char lab[32];
        hf_svg_tick_label(&t, i, lab, sizeof lab);
        fprintf(out,
                "<line x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" stroke=\"#cccccc\" "
                "stroke-dasharray=\"2 3\"/>\n",
                x, top - 4, x, bottom);
        hf_svg_text(out, x, bottom + 16, 'm', 12, 0, 0, lab);
    }
    hf_svg_text(out, left + pw / 2, bottom + 36, 'm', 12, 0, 0, "offset from rest (m)");
    budget_bars(out, &t, left, pw, top, row, n, labels, part);
    if (limit > 0.0) {
        double x = left + (limit - t.lo) / (t.hi - t.lo) * pw;
        fprintf(out,
                "<line x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" stroke=\"#333333\" "
                "stroke-width=\"1.5\" stroke-dasharray=\"6 3\"/>\n",
                x, top - 10, x, bottom);
        hf_svg_text(out, x, top - 14, 'm', 11, 0, 0, "offset limit");
    }
    static const char *const legend[3] = {"mean", "low frequency (of the governing combination)",
                                          "wave frequency"};
    double x = 20.0;
    for (int k = 0; k < 3; k++) {
        fprintf(out, "<rect x=\"%.2f\" y=\"%.2f\" width=\"14\" height=\"10\" fill=\"%s\"/>\n", x,
                H - 16, hf_svg_colour((size_t)k));
        hf_svg_text(out, x + 18, H - 7, 's', 11, 0, 0, legend[k]);
        x += 40.0 + 6.5 * (double)strlen(legend[k]); /* about 0.6 em a character */
    }
    hf_svg_end(out);
    return HF_OK;
}

/* ---- the Case section ---- */

static void case_hull(hf_report *r, const hf_designdata *d)
{
    static const char *const cols[] = {"quantity", "value"};
    char a[32], b[32], c[32], t[HF_ERROR_TEXT];
    hf_report_table_begin(r, "Hull for the design method (docs/design.md)", cols, 2);
    num(a, d->mass / 1e3, 6), num(b, d->added_mass[0] / 1e3, 5), num(c, d->added_mass[1] / 1e3, 5);
    snprintf(t, sizeof t, "%s t; added %s t surge, %s t sway", a, b, c);
    const char *row[2] = {"mass", t};
    hf_report_table_row(r, row);
    num(a, d->yaw_inertia / 1e3, 5), num(b, d->added_yaw_inertia / 1e3, 5);
    snprintf(t, sizeof t, "%s t m\xc2\xb2; added %s t m\xc2\xb2", a, b);
    row[0] = "yaw inertia";
    hf_report_table_row(r, row);
    snprintf(t, sizeof t, "%.3g %%, %.3g %%, %.3g %% of critical (surge, sway, yaw)",
             100 * d->damping[0], 100 * d->damping[1], 100 * d->damping[2]);
    row[0] = "low-frequency damping";
    hf_report_table_row(r, row);
    num(a, d->wind_area, 5), num(b, d->current_area, 5), num(c, d->length, 5);
    snprintf(t, sizeof t, "wind %s m\xc2\xb2, current %s m\xc2\xb2, length %s m", a, b, c);
    row[0] = "reference areas, length";
    hf_report_table_row(r, row);
    for (int i = 0; i < HF_DD_NTABLES; i++) {
        if (!d->table[i])
            continue;
        double lo, hi;
        hf_table_freq_range(d->table[i], &lo, &hi);
        snprintf(t, sizeof t, "%s: %zu frequencies (%.3g to %.3g rad/s) x %zu headings", d->path[i],
                 hf_table_nfreq(d->table[i]), lo, hi, hf_table_nheading(d->table[i]));
        if (hf_table_nfreq(d->table[i]) == 0)
            snprintf(t, sizeof t, "%s: %zu headings", d->path[i], hf_table_nheading(d->table[i]));
        row[0] = hf_designdata_table_key(i);
        hf_report_table_row(r, row);
    }
    hf_report_table_end(r);
}

void hf_report_design_case(hf_report *r, const hf_model *m)
{
    const hf_designdata *d = m->design;
    if (!d)
        return;
    case_hull(r, d);
    if (d->nenv == 0)
        return;
    static const char *const cols[] = {"environment", "wind (m/s toward deg)",
                                       "current (m/s toward deg)",
                                       "waves Hs (m), Tp (s), gamma toward deg", "duration (h)"};
    hf_report_table_begin(r, "Environments (directions: where they go toward)", cols, 5);
    for (size_t i = 0; i < d->nenv; i++) {
        const hf_environment *e = &d->env[i].env;
        char w[64] = "-", c[64] = "-", wv[96] = "-", du[32];
        if (e->has_wind)
            snprintf(w, sizeof w, "%.3g toward %.4g", e->wind.speed, e->wind.direction * RAD2DEG);
        if (e->has_current)
            snprintf(c, sizeof c, "%.3g toward %.4g", e->current.speed,
                     e->current.direction * RAD2DEG);
        if (e->has_waves)
            snprintf(wv, sizeof wv, "%.3g, %.3g, %.3g toward %.4g", e->waves.hs, e->waves.tp,
                     e->waves.gamma, e->waves.direction * RAD2DEG);
        num(du, e->duration / 3600.0, 4);
        const char *cells[5] = {d->env[i].name, w, c, wv, du};
        hf_report_table_row(r, cells);
    }
    hf_report_table_end(r);
}

/* ---- the design study ---- */

/* What the report keeps of one condition once the next is solved. */
typedef struct {
    int ok, passed, offset_passed, overloaded;
    double part[3]; /* mean, LF and WF parts of the governing combination, m */
    double design, yaw, tmean, tdesign, util, factor, required;
    size_t worst; /* line with the largest utilisation, or (size_t)-1 */
    char label[HF_MODEL_MAX_NAME + 16];
} cond_summary;

static void summarise(const hf_model *m, const hf_design_result *r, cond_summary *c)
{
    memset(c, 0, sizeof *c);
    hf_design_condition_name(m, r, c->label, sizeof c->label);
    c->worst = (size_t)-1;
    if (r->status != HF_OK)
        return;
    const hf_env_design *g = &r->design;
    int lf = g->combo_lf_max >= g->combo_wf_max;
    c->ok = 1, c->passed = r->passed, c->offset_passed = r->offset_passed;
    c->overloaded = r->overloaded;
    c->part[0] = g->mean;
    c->part[1] = lf ? g->lf_max : g->lf_sig;
    c->part[2] = lf ? g->wf_sig : g->wf_max;
    c->design = g->offset, c->yaw = g->yaw;
    if (r->max_utilisation_line < m->nlines) {
        size_t w = c->worst = r->max_utilisation_line;
        c->tmean = r->tension_mean[w], c->tdesign = r->tension[w], c->util = r->utilisation[w];
        c->factor = r->line[w].factor, c->required = r->line[w].required;
    }
}

/* The tensions table and one check per condition. */
static void env_table(hf_report *rep, const hf_model *m, const char *env, const cond_summary *cs,
                      size_t n)
{
    static const char *const cols[] = {"condition",
                                       "design offset (m)",
                                       "worst line",
                                       "mean tension (kN)",
                                       "design tension (kN)",
                                       "utilisation",
                                       "MBL/T",
                                       "required MBL/T",
                                       "verdict"};
    char cap[HF_MODEL_MAX_NAME + 64];
    snprintf(cap, sizeof cap, "Tensions at the design pose, environment %s", env);
    hf_report_table_begin(rep, cap, cols, 9);
    for (size_t i = 0; i < n; i++) {
        const cond_summary *c = &cs[i];
        char v[6][32];
        num(v[0], c->design, 4), num(v[1], c->tmean / 1e3, 5), num(v[2], c->tdesign / 1e3, 5);
        num(v[3], c->util, 3), num(v[4], c->factor, 3), num(v[5], c->required, 3);
        const char *wl = c->worst < m->nlines ? m->lines[c->worst].name : "-";
        const char *row[9] = {c->label,
                              v[0],
                              wl,
                              v[1],
                              v[2],
                              v[3],
                              v[4],
                              c->required > 0 ? v[5] : "-",
                              !c->ok      ? "NO RESULT"
                              : c->passed ? "PASS"
                                          : "FAIL"};
        if (!c->ok)
            for (int k = 1; k < 8; k++)
                row[k] = "-";
        hf_report_table_row(rep, row);
    }
    hf_report_table_end(rep);
    for (size_t i = 0; i < n; i++) {
        const cond_summary *c = &cs[i];
        char item[2 * HF_MODEL_MAX_NAME + 32], req[256], res[160], a[32], b[32];
        snprintf(item, sizeof item, "environment %s, %s", env, c->label);
        num(a, c->required, 3), num(b, m->criteria.max_offset, 4);
        snprintf(req, sizeof req, "at the design pose: MBL/T at least %s%s%s%s; T below MBL",
                 c->required > 0 ? a : "(no factor)",
                 m->criteria.max_offset > 0 ? ", offset at most " : "",
                 m->criteria.max_offset > 0 ? b : "", m->criteria.max_offset > 0 ? " m" : "");
        num(a, c->factor, 3), num(b, c->design, 4);
        if (c->ok)
            snprintf(res, sizeof res, "MBL/T %s, design offset %s m%s", a, b,
                     c->overloaded ? ", OVERLOADED" : "");
        else
            snprintf(res, sizeof res, "no result");
        hf_report_check(rep, item, req, res, c->ok && c->passed);
    }
}

/* Spectrum and budget figures of one environment. */
static void env_figures(hf_report *rep, const hf_model *m, const char *env, const hf_spectrum *sp,
                        const cond_summary *cs, size_t n, const char **labels, double *part)
{
    hf_error fe;
    hf_error_clear(&fe);
    char title[HF_MODEL_MAX_NAME + 96];
    if (sp) {
        const hf_designdata *d = m->design;
        double lo[2] = {0, 0}, hi[2] = {0, 0};
        const char *names[2] = {"RAO table", "drift table"};
        hf_table_freq_range(d->table[HF_DD_RAOS], &lo[0], &hi[0]);
        hf_table_freq_range(d->table[HF_DD_DRIFT], &lo[1], &hi[1]);
        snprintf(title, sizeof title, "JONSWAP spectrum, environment %s", env);
        FILE *f = hf_report_figure_begin(rep);
        hf_status st = hf_report_svg_spectrum(f, sp, title, 2, lo, hi, names, 0, &fe);
        char cap[256];
        snprintf(cap, sizeof cap,
                 "Wave spectrum: Hs %.3g m, Tp %.3g s, gamma %.3g; scaled numerically to m0 = "
                 "Hs\xc2\xb2/16 (factor %.4f; closed form 1 - 0.287 ln gamma = %.4f).",
                 sp->hs, sp->tp, sp->gamma, sp->scale, sp->scale_closed);
        hf_report_figure_end(rep, cap);
        if (st != HF_OK)
            hf_report_note(rep, "note", fe.text);
    }
    for (size_t i = 0; i < n; i++) {
        labels[i] = cs[i].label;
        memcpy(&part[i * 3], cs[i].part, sizeof cs[i].part);
    }
    snprintf(title, sizeof title, "Motion budget, environment %s", env);
    FILE *f = hf_report_figure_begin(rep);
    hf_status st = hf_report_svg_budget(f, title, n, labels, part, m->criteria.max_offset, 0, &fe);
    hf_report_figure_end(rep, "Design offset of each condition: mean offset plus the low- and "
                              "wave-frequency parts of the larger combination (LF max + WF "
                              "significant, or LF significant + WF max). A condition without a "
                              "result shows no bar.");
    if (st != HF_OK)
        hf_report_note(rep, "note", fe.text);
}

/* Work arrays of a study, allocated once. */
typedef struct {
    cond_summary *cs;
    const char **labels;
    double *part;
} study_mem;

static hf_status env_run(const hf_model *m, hf_design *d, size_t e, FILE *csv, hf_report *rep,
                         study_mem *w, hf_report_design_count *n)
{
    size_t nc = hf_design_ncond(d);
    hf_spectrum sp;
    int has_sp = 0;
    for (size_t k = 0; k < nc; k++) {
        hf_error e2;
        hf_design_solve(d, e, k, &e2); /* the result carries a failure */
        const hf_design_result *r = hf_design_result_get(d);
        n->nonfinite += hf_design_csv_row_write(csv, m, r);
        summarise(m, r, &w->cs[k]);
        n->conditions++;
        if (r->status != HF_OK)
            n->noresult++;
        else if (r->passed)
            n->passed++;
        else
            n->failed++;
        if (r->status == HF_OK && m->design->env[e].env.has_waves && !has_sp)
            sp = r->motion.spectrum, has_sp = 1;
    }
    const char *env = m->design->env[e].name;
    char para[256];
    snprintf(para, sizeof para, "Environment %s: %zu conditions (intact and each line broken).",
             env, nc);
    hf_report_paragraph(rep, para);
    env_figures(rep, m, env, has_sp ? &sp : NULL, w->cs, nc, w->labels, w->part);
    env_table(rep, m, env, w->cs, nc);
    return ferror(csv) ? HF_EIO : HF_OK;
}

hf_status hf_report_design_study(const hf_model *m, const hf_study *s, FILE *csv, hf_report *rep,
                                 hf_report_design_count *n, hf_error *err)
{
    memset(n, 0, sizeof *n);
    for (size_t i = 0; i < s->nenvironments; i++)
        if (hf_designdata_env_find(m->design, s->environments[i]) == (size_t)-1)
            return hf_error_set(err, HF_EINVAL, "design study %s: no environment named %s", s->name,
                                s->environments[i]);
    hf_design *d = hf_design_alloc(m, err);
    if (!d)
        return err->status;
    size_t nc = hf_design_ncond(d);
    study_mem w = {hf_calloc(nc, sizeof *w.cs), hf_calloc(nc, sizeof *w.labels),
                   hf_calloc(3 * nc, sizeof *w.part)};
    hf_status st = w.cs && w.labels && w.part ? HF_OK : HF_ENOMEM;
    if (st != HF_OK)
        hf_error_set(err, st, "design study %s: out of memory", s->name);
    if (st == HF_OK)
        st = hf_design_csv_header_write(csv, m, err);
    if (st == HF_OK) {
        char head[HF_MODEL_MAX_NAME + 64];
        snprintf(head, sizeof head, "Design offsets and tensions: %s", s->name);
        hf_report_section(rep, head,
                          "The quasi-static design method (docs/design.md): mean pose under the "
                          "environment's wind, current and mean wave drift; slow-drift and "
                          "wave-frequency motions; design offset = mean + the larger of (LF max "
                          "+ WF significant) and (LF significant + WF max); line tensions at the "
                          "design pose checked with the quasi-static factors.");
        hf_report_note(rep, "warning", hf_design_caution_text);
    }
    for (size_t e = 0; st == HF_OK && e < hf_design_nenv(d); e++) {
        int pick = s->nenvironments == 0;
        for (size_t i = 0; i < s->nenvironments; i++)
            pick |= !strcmp(s->environments[i], m->design->env[e].name);
        if (pick && (st = env_run(m, d, e, csv, rep, &w, n)) != HF_OK)
            hf_error_set(err, st, "design study %s: write error", s->name);
    }
    hf_free(w.cs), hf_free(w.labels), hf_free(w.part);
    hf_design_free(d);
    return st;
}
