/* spread_example.c - a tour of the holdfast C library (docs/library.md).
 *
 * Build against an installed holdfast (make install) with pkg-config:
 *
 *     cc -std=c11 spread_example.c $(pkg-config --cflags --libs holdfast) -o spread_example
 *     ./spread_example cases/barge.yaml
 *
 * It loads a case from a file and a second one from a string, reads and sets
 * a parameter by path (the paths of `holdfast sweep --vary`), solves every
 * line at a pose, the 6x6 stiffness, a restoring curve and the mean position
 * under each load case, intact and with each line broken, and prints each as
 * a table; then the same through the session API (session.h), the handle
 * with ready-made tables that the Python package binds.  The column names are those of the command
 * line's CSV files
 * (`holdfast lines --csv`, `stiffness --csv`, `curve --csv`, `balance --csv`,
 * `sweep --csv`) and the numbers are printed as those files print them
 * (%.10g), so tests/install-check.sh compares the two cell by cell.
 *
 * The library works in SI units (m, N, rad); this program converts to kN
 * and degrees for printing, as the CSV files do.
 *
 * CAUTION: quasi-static results.  Line dynamics, snap loads, wear and
 * corrosion are not included.  Check against the governing classification
 * rules or local codes; results must be approved by a competent, licensed
 * engineer before anyone relies on them. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <holdfast/analysis.h>
#include <holdfast/balance.h>
#include <holdfast/case.h>
#include <holdfast/caution.h>
#include <holdfast/model.h>
#include <holdfast/session.h>
#include <holdfast/spread.h>
#include <holdfast/status.h>

#define PI 3.14159265358979323846
#define KN 1e3 /* N per kN */

/* A case given as text (fictional: one chain line in the invented Tarrow
 * Point training basin; numbers made up for teaching). */
static const char small_case[] = "title: One chain at the Tarrow Point basin (fictional)\n"
                                 "site: {depth: 48 m}\n"
                                 "components:\n"
                                 "  chain: {type: studless_chain, grade: R3S, diameter: 52 mm}\n"
                                 "lines:\n"
                                 "  - name: practice\n"
                                 "    anchor: [-365, 0]\n"
                                 "    fairlead: [0, 0, -6]\n"
                                 "    sections: [{component: chain, length: 370 m}]\n";

/* Prints the library's message and returns 1 (the exit status). */
static int fail(const char *what, const hf_error *err)
{
    fprintf(stderr, "spread_example: %s: %s (%s)\n", what, err->text, hf_status_str(err->status));
    return 1;
}

/* The case from a string: every line at rest, and a loader error. */
static int from_string(void)
{
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (hf_case_load_buffer(small_case, strlen(small_case), "small.yaml", &m, &err) != HF_OK)
        return fail("small case", &err);
    hf_analysis_pose a;
    const double rest[3] = {0, 0, 0};
    hf_analysis_pose_init(&a);
    hf_status s = hf_analysis_pose_solve(&a, &m, rest, 0, &err);
    if (s == HF_OK)
        printf("== string case '%s': line %s, fairlead tension %.10g kN\n", m.title,
               m.lines[0].name, a.res.states[0].tension / KN);
    hf_analysis_pose_clear(&a);
    hf_model_free(&m);
    if (s != HF_OK)
        return fail("small case at rest", &err);

    /* Bad input: the message names file:line:column, as the command line's. */
    char bad[sizeof small_case];
    snprintf(bad, sizeof bad, "%s", small_case);
    memcpy(strstr(bad, "370 m"), "370 t", 5); /* a mass where a length belongs */
    hf_model_init(&m);
    s = hf_case_load_buffer(bad, strlen(bad), "bad.yaml", &m, &err);
    printf("== bad string case: %s: %s\n", hf_status_str(s), err.text);
    hf_model_free(&m);
    return s == HF_EINVAL ? 0 : 1;
}

/* Every line at the rest pose moved by offset (m, m, rad). */
static int lines_at(const hf_model *m, const double offset[3])
{
    hf_analysis_pose a;
    hf_error err;
    hf_analysis_pose_init(&a);
    if (hf_analysis_pose_solve(&a, m, offset, 0, &err) != HF_OK) {
        hf_analysis_pose_clear(&a);
        return fail("lines", &err);
    }
    printf("== lines at offset surge %g m, sway %g m, yaw %g deg\n", offset[0], offset[1],
           offset[2] * 180 / PI);
    printf("line status fairlead_tension_kN fairlead_horizontal_kN fairlead_vertical_kN "
           "grounded_m max_utilisation\n");
    for (size_t i = 0; i < m->nlines; i++) {
        const hf_line_state *s = &a.res.states[i];
        printf("%s %s %.10g %.10g %.10g %.10g %.10g\n", m->lines[i].name,
               hf_line_regime_name(s->regime), s->tension / KN, s->h / KN, s->v / KN, s->grounded,
               s->max_utilisation);
    }
    hf_analysis_pose_clear(&a);
    return 0;
}

/* The 6x6 stiffness at rest, in kN/m, kN/rad, kN m/m, kN m/rad, and the
 * static mooring load on the hull (kN, kN m). */
static int stiffness(const hf_model *m)
{
    static const char *const dof[6] = {"surge", "sway", "heave", "roll", "pitch", "yaw"};
    hf_analysis_pose a;
    hf_error err;
    const double rest[3] = {0, 0, 0};
    hf_analysis_pose_init(&a);
    if (hf_analysis_pose_solve(&a, m, rest, 1, &err) != HF_OK) {
        hf_analysis_pose_clear(&a);
        return fail("stiffness", &err);
    }
    printf("== stiffness at rest\nrow surge sway heave roll pitch yaw\n");
    for (int i = 0; i < 6; i++) {
        printf("%s", dof[i]);
        for (int j = 0; j < 6; j++)
            printf(" %.10g", a.K[i][j] / KN);
        printf("\n");
    }
    printf("static_load");
    for (int j = 0; j < 6; j++)
        printf(" %.10g", a.res.force[j] / KN);
    printf("\n");
    hf_analysis_pose_clear(&a);
    return 0;
}

/* Restoring curve toward 30 degrees, offsets -10 m to 10 m by 2.5 m. */
static int curve(const hf_model *m)
{
    hf_error err;
    hf_analysis_curve *c = hf_analysis_curve_alloc(m, 9, &err);
    if (!c)
        return fail("curve", &err);
    if (hf_analysis_curve_compute(c, m, 30 * PI / 180, -10, 10, 2.5, &err) != HF_OK) {
        hf_analysis_curve_free(c);
        return fail("curve", &err);
    }
    printf("== curve toward 30 deg\n"
           "offset_m restoring_kN stiffness_kN_per_m max_tension_kN max_tension_line\n");
    for (size_t k = 0; k < c->n; k++) {
        if (c->status[k] != HF_OK) { /* a failed offset: NaN values, never printed as numbers */
            printf("%.10g no-solution - - -\n", c->offset[k]);
            continue;
        }
        printf("%.10g %.10g %.10g %.10g %s\n", c->offset[k], c->restoring[k] / KN,
               c->stiffness[k] / KN, c->max_tension[k] / KN, m->lines[c->max_tension_line[k]].name);
    }
    int bad = c->nfailed > 0;
    if (bad)
        fprintf(stderr, "spread_example: %s\n", c->first_error.text);
    hf_analysis_curve_free(c);
    return bad;
}

/* One balance row: load, condition, status, offsets, largest tension. */
static void balance_row(const hf_model *m, const hf_load *l, const hf_balance_result *r)
{
    char cond[HF_MODEL_MAX_NAME + 16];
    if (r->broken == HF_BALANCE_NONE)
        snprintf(cond, sizeof cond, "intact");
    else
        snprintf(cond, sizeof cond, "broken:%s", m->lines[r->broken].name);
    if (r->status != HF_OK) {
        printf("%s %s %s - - - -\n", l->name, cond, hf_status_str(r->status));
        return;
    }
    printf("%s %s %s %.10g %.10g %.10g %.10g %d\n", l->name, cond, hf_status_str(r->status),
           r->offset[0], r->offset[1], r->offset[2] * 180 / PI, r->max_tension / KN, r->passed);
}

/* Mean position under every load case, intact and with each line broken. */
static int balance(const hf_model *m)
{
    hf_error err;
    hf_balance *b = hf_balance_alloc(m, &err);
    if (!b)
        return fail("balance", &err);
    printf("== balance\nload condition status surge_m sway_m yaw_deg max_tension_kN passed\n");
    for (size_t k = 0; k < m->nloads; k++) {
        hf_status s = hf_balance_run(b, &m->loads[k], &err);
        if (s == HF_EINVAL || s == HF_ENOMEM || s == HF_ELIMIT) {
            hf_balance_free(b);
            return fail(m->loads[k].name, &err);
        }
        /* Other statuses are results: a condition without equilibrium is a row. */
        for (size_t c = 0; c < hf_balance_ncond(b); c++)
            balance_row(m, &m->loads[k], hf_balance_result_at(b, c));
    }
    hf_balance_free(b);
    return 0;
}

/* Reads site.water_level, sets it to 1.5 m, prints the line tensions, and
 * shows that a bad value is refused and leaves the model as it was. */
static int parameter(hf_model *m)
{
    const char *path = "site.water_level";
    hf_param p;
    hf_error err;
    double before, after;
    if (hf_model_param_lookup(m, path, &p, &err) != HF_OK ||
        hf_model_param_get(m, &p, &before, &err) != HF_OK ||
        hf_model_param_set(m, &p, 1.5, &err) != HF_OK)
        return fail(path, &err);
    hf_param q;
    if (hf_model_param_lookup(m, "site.depth", &q, &err) != HF_OK)
        return fail("site.depth", &err);
    hf_status s = hf_model_param_set(m, &q, -3.25, &err); /* refused: depth must be > 0 */
    printf("== parameter: setting site.depth to -3.25 m: %s: %s\n", hf_status_str(s), err.text);
    if (s == HF_OK || hf_model_param_get(m, &p, &after, &err) != HF_OK)
        return 1;
    hf_analysis_pose a;
    const double rest[3] = {0, 0, 0};
    hf_analysis_pose_init(&a);
    if (hf_analysis_pose_solve(&a, m, rest, 1, &err) != HF_OK) {
        hf_analysis_pose_clear(&a);
        return fail("lines after the change", &err);
    }
    printf("== parameter %s was %.10g m, now %.10g m\n%s_m", path, before, after, path);
    for (size_t i = 0; i < m->nlines; i++)
        printf(" T_%s_kN", m->lines[i].name);
    printf(" stiffness_surge_kN_per_m\n%.10g", after);
    for (size_t i = 0; i < m->nlines; i++)
        printf(" %.10g", a.res.line_tension[i] / KN);
    printf(" %.10g\n", a.K[0][0] / KN);
    hf_analysis_pose_clear(&a);
    return 0;
}

/* A session table as text: the header, then one row per line; an empty
 * cell (no value, or empty text) is printed "-". */
static void print_table(const char *title, const hf_session_table *t)
{
    size_t nr = hf_session_table_rows(t), nc = hf_session_table_columns(t);
    const double *v = hf_session_table_values(t);
    printf("%s\n", title);
    for (size_t j = 0; j < nc; j++)
        printf("%s%s", j ? " " : "", hf_session_table_column(t, j));
    printf("\n");
    for (size_t i = 0; i < nr; i++) {
        for (size_t j = 0; j < nc; j++) {
            const char *text = hf_session_table_text(t, i, j);
            printf("%s", j ? " " : "");
            if (hf_session_table_is_empty(t, i, j) || (text && !*text))
                printf("-");
            else if (text)
                printf("%s", text);
            else
                printf("%.10g", v[i * nc + j]);
        }
        printf("\n");
    }
}

/* The session API: one handle owns the case and its workspaces; every call
 * returns a status and leaves its message in the session; tables belong to
 * the caller. */
static int session_tour(const char *path)
{
    hf_session *s = hf_session_alloc(); /* also installs the GSL handler */
    if (!s) {
        fprintf(stderr, "spread_example: session: out of memory\n");
        return 1;
    }
    hf_session_table *lines = NULL, *k = NULL;
    const double offset[3] = {3, -2, 4 * PI / 180};
    double level = 0;
    int bad = hf_session_load_file(s, path) != HF_OK ||
              hf_session_lines(s, offset, &lines) != HF_OK ||
              hf_session_stiffness(s, NULL, &k) != HF_OK ||
              hf_session_set_text(s, "site.water_level", "150 cm") != HF_OK ||
              hf_session_get(s, "site.water_level", &level) != HF_OK;
    if (bad) {
        fprintf(stderr, "spread_example: session: %s\n", hf_session_message(s));
    } else {
        print_table("== session: lines at offset surge 3 m, sway -2 m, yaw 4 deg", lines);
        print_table("== session: stiffness at rest", k);
        printf("== session: site.water_level set to \"150 cm\" reads %.10g m (SI)\n", level);
        hf_status st = hf_session_set_text(s, "site.depth", "-3 m");
        printf("== session: site.depth = \"-3 m\": %s: %s\n", hf_status_str(st),
               hf_session_message(s));
        bad = st == HF_OK;
    }
    hf_session_table_free(lines);
    hf_session_table_free(k);
    hf_session_free(s);
    return bad;
}

int main(int argc, char **argv)
{
    const char *path = argc > 1 ? argv[1] : "cases/barge.yaml";
    hf_model m;
    hf_error err;
    hf_gsl_handler_install(); /* GSL errors become statuses, never an abort */
    hf_model_init(&m);
    if (hf_case_load(path, &m, &err) != HF_OK)
        return fail(path, &err);
    printf("== case '%s' from %s: %zu lines, %zu load cases\n", m.title, path, m.nlines, m.nloads);
    const double offset[3] = {3, -2, 4 * PI / 180};
    int bad = from_string() || lines_at(&m, offset) || stiffness(&m) || curve(&m) || balance(&m) ||
              parameter(&m) || session_tour(path);
    hf_model_free(&m);
    printf("\n%s", hf_caution_text);
    return bad;
}
