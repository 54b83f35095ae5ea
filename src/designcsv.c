/* designcsv.c - CSV rows of the design check (designcsv.h): one column
 * table, so the header and the rows cannot drift apart. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/csv.h"
#include "holdfast/designcsv.h"
#include "holdfast/designdata.h"

#define RAD2DEG (180.0 / M_PI)

const char hf_design_caution_text[] =
    "The design offset is the quasi-static method's: it leaves out line dynamics (the\n"
    "dynamic factors of the rules are meant to cover them), the transient motion of the\n"
    "hull after a line breaks, and second-order coupling between the degrees of freedom\n"
    "(surge, sway and yaw are separate oscillators). Wind and current are steady.\n";

const char *hf_design_condition_name(const hf_model *m, const hf_design_result *r, char *buf,
                                     size_t cap)
{
    if (r->broken == HF_DESIGN_INTACT || r->broken >= m->nlines)
        snprintf(buf, cap, "intact");
    else
        snprintf(buf, cap, "broken:%s", m->lines[r->broken].name);
    return buf;
}

/* A numeric column: name and value of a solved result. */
typedef struct {
    const char *name;
    double (*get)(const hf_design_result *r);
} column;

#define DOF(r, i) ((r)->motion.dof[(i)])
/* clang-format off */
static double mean_surge(const hf_design_result *r) { return r->mean_offset[0]; }
static double mean_sway(const hf_design_result *r) { return r->mean_offset[1]; }
static double mean_yaw(const hf_design_result *r) { return r->mean_offset[2] * RAD2DEG; }
static double tn_surge(const hf_design_result *r) { return DOF(r, 0).lf_period; }
static double tn_sway(const hf_design_result *r) { return DOF(r, 1).lf_period; }
static double tn_yaw(const hf_design_result *r) { return DOF(r, 2).lf_period; }
static double lfs_surge(const hf_design_result *r) { return DOF(r, 0).lf_sig; }
static double lfm_surge(const hf_design_result *r) { return DOF(r, 0).lf_max; }
static double wfs_surge(const hf_design_result *r) { return DOF(r, 0).wf_sig; }
static double wfm_surge(const hf_design_result *r) { return DOF(r, 0).wf_max; }
static double lfs_sway(const hf_design_result *r) { return DOF(r, 1).lf_sig; }
static double wfs_sway(const hf_design_result *r) { return DOF(r, 1).wf_sig; }
static double design_off(const hf_design_result *r) { return r->design.offset; }
static double tmax(const hf_design_result *r) { return r->max_tension / 1e3; }
static double lfm_sway(const hf_design_result *r) { return DOF(r, 1).lf_max; }
static double wfm_sway(const hf_design_result *r) { return DOF(r, 1).wf_max; }
static double lfs_yaw(const hf_design_result *r) { return DOF(r, 2).lf_sig * RAD2DEG; }
static double lfm_yaw(const hf_design_result *r) { return DOF(r, 2).lf_max * RAD2DEG; }
static double wfs_yaw(const hf_design_result *r) { return DOF(r, 2).wf_sig * RAD2DEG; }
static double wfm_yaw(const hf_design_result *r) { return DOF(r, 2).wf_max * RAD2DEG; }
static double var_surge(const hf_design_result *r) { return DOF(r, 0).lf_var; }
static double varw_surge(const hf_design_result *r) { return DOF(r, 0).lf_var_white; }
static double var_sway(const hf_design_result *r) { return DOF(r, 1).lf_var; }
static double varw_sway(const hf_design_result *r) { return DOF(r, 1).lf_var_white; }
static double tz_surge(const hf_design_result *r) { return DOF(r, 0).wf_tz; }
static double tz_sway(const hf_design_result *r) { return DOF(r, 1).wf_tz; }
static double k_surge(const hf_design_result *r) { return DOF(r, 0).stiffness / 1e3; }
static double k_sway(const hf_design_result *r) { return DOF(r, 1).stiffness / 1e3; }
static double mean_off(const hf_design_result *r) { return r->design.mean; }
static double dir(const hf_design_result *r) { return r->design.direction * RAD2DEG; }
static double lf_along(const hf_design_result *r) { return r->design.lf_max; }
static double wf_along(const hf_design_result *r) { return r->design.wf_max; }
static double lfs_along(const hf_design_result *r) { return r->design.lf_sig; }
static double wfs_along(const hf_design_result *r) { return r->design.wf_sig; }
static double combo_lf(const hf_design_result *r) { return r->design.combo_lf_max; }
static double combo_wf(const hf_design_result *r) { return r->design.combo_wf_max; }
static double dyaw(const hf_design_result *r) { return r->design.yaw * RAD2DEG; }
static double tmean(const hf_design_result *r) { return r->max_tension_mean / 1e3; }
static double tlf(const hf_design_result *r) { return r->max_tension_combo[0] / 1e3; }
static double twf(const hf_design_result *r) { return r->max_tension_combo[1] / 1e3; }
static double load_x(const hf_design_result *r) { return r->mean.total_global[0] / 1e3; }
static double load_y(const hf_design_result *r) { return r->mean.total_global[1] / 1e3; }
static double load_mz(const hf_design_result *r) { return r->mean.total_global[2] / 1e3; }
static double out_rao(const hf_design_result *r) { return r->outside[0]; }
static double out_drift(const hf_design_result *r) { return r->outside[1]; }
/* clang-format on */

/* The columns between status and max_tension_line, and after passed. */
static const column head[] = {
    {"mean_surge_m", mean_surge},    {"mean_sway_m", mean_sway},    {"mean_yaw_deg", mean_yaw},
    {"lf_period_surge_s", tn_surge}, {"lf_period_sway_s", tn_sway}, {"lf_sig_surge_m", lfs_surge},
    {"lf_max_surge_m", lfm_surge},   {"wf_sig_surge_m", wfs_surge}, {"wf_max_surge_m", wfm_surge},
    {"lf_sig_sway_m", lfs_sway},     {"wf_sig_sway_m", wfs_sway},   {"design_offset_m", design_off},
    {"max_tension_kN", tmax}};
static const column tail[] = {{"lf_period_yaw_s", tn_yaw},
                              {"lf_max_sway_m", lfm_sway},
                              {"wf_max_sway_m", wfm_sway},
                              {"lf_sig_yaw_deg", lfs_yaw},
                              {"lf_max_yaw_deg", lfm_yaw},
                              {"wf_sig_yaw_deg", wfs_yaw},
                              {"wf_max_yaw_deg", wfm_yaw},
                              {"lf_var_surge_m2", var_surge},
                              {"lf_var_white_surge_m2", varw_surge},
                              {"lf_var_sway_m2", var_sway},
                              {"lf_var_white_sway_m2", varw_sway},
                              {"wf_tz_surge_s", tz_surge},
                              {"wf_tz_sway_s", tz_sway},
                              {"stiffness_surge_kN_per_m", k_surge},
                              {"stiffness_sway_kN_per_m", k_sway},
                              {"mean_offset_m", mean_off},
                              {"design_direction_deg", dir},
                              {"lf_sig_along_m", lfs_along},
                              {"lf_max_along_m", lf_along},
                              {"wf_sig_along_m", wfs_along},
                              {"wf_max_along_m", wf_along},
                              {"lf_max_plus_wf_sig_m", combo_lf},
                              {"lf_sig_plus_wf_max_m", combo_wf},
                              {"design_yaw_deg", dyaw},
                              {"mean_max_tension_kN", tmean},
                              {"max_tension_lf_max_pose_kN", tlf},
                              {"max_tension_wf_max_pose_kN", twf},
                              {"mean_load_x_kN", load_x},
                              {"mean_load_y_kN", load_y},
                              {"mean_load_mz_kNm", load_mz},
                              {"outside_raos", out_rao},
                              {"outside_drift", out_drift}};
#define NHEAD (sizeof head / sizeof head[0])
#define NTAIL (sizeof tail / sizeof tail[0])

hf_status hf_design_csv_header_write(FILE *out, const hf_model *m, hf_error *err)
{
    (void)m;
    const char *names[3 + NHEAD + 3 + NTAIL + 4];
    size_t n = 0;
    names[n++] = "environment", names[n++] = "condition", names[n++] = "status";
    for (size_t i = 0; i < NHEAD; i++)
        names[n++] = head[i].name;
    names[n++] = "max_tension_line", names[n++] = "max_utilisation", names[n++] = "passed";
    for (size_t i = 0; i < NTAIL; i++)
        names[n++] = tail[i].name;
    names[n++] = "max_utilisation_line", names[n++] = "offset_passed";
    names[n++] = "alert", names[n++] = "message";
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header_array(&c, names, n);
    if (ferror(out))
        return hf_error_set(err, HF_EIO, "design CSV: write error");
    return HF_OK;
}

static void numbers(hf_csv *c, const column *cols, size_t n, const hf_design_result *r, int ok)
{
    for (size_t i = 0; i < n; i++) {
        if (ok)
            hf_csv_field_double(c, cols[i].get(r));
        else
            hf_csv_field_empty(c);
    }
}

static const char *line_or_empty(const hf_model *m, size_t i)
{
    return i < m->nlines ? m->lines[i].name : "";
}

size_t hf_design_csv_row_write(FILE *out, const hf_model *m, const hf_design_result *r)
{
    char cn[HF_MODEL_MAX_NAME + 16], sn[64];
    int ok = r->status == HF_OK;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_field_str(&c, m->design && r->env < m->design->nenv ? m->design->env[r->env].name : "");
    hf_csv_field_str(&c, hf_design_condition_name(m, r, cn, sizeof cn));
    hf_csv_field_str(&c, hf_design_status_name(r, sn, sizeof sn));
    numbers(&c, head, NHEAD, r, ok);
    hf_csv_field_str(&c, ok ? line_or_empty(m, r->max_tension_line) : "");
    if (ok)
        hf_csv_field_double(&c, r->max_utilisation);
    else
        hf_csv_field_empty(&c);
    hf_csv_field_long(&c, r->passed ? 1 : 0);
    numbers(&c, tail, NTAIL, r, ok);
    hf_csv_field_str(&c, ok ? line_or_empty(m, r->max_utilisation_line) : "");
    if (ok)
        hf_csv_field_long(&c, r->offset_passed ? 1 : 0);
    else
        hf_csv_field_empty(&c);
    hf_csv_field_str(&c, ok && r->overloaded ? "overloaded" : "");
    hf_csv_field_str(&c, r->message);
    hf_csv_end_row(&c);
    return c.nonfinite;
}
