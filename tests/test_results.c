/* test_results.c - results writers: exact headers, rows that parse back, NaN never silent. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/results.h"

/* ---- capture: a writer's output in memory (POSIX open_memstream) ---- */

typedef struct {
    FILE *f;
    char *buf;
    size_t len;
} capture;

static void cap_open(capture *c)
{
    c->buf = NULL;
    c->len = 0;
    c->f = open_memstream(&c->buf, &c->len);
    assert_non_null(c->f);
}

/* Closes the stream; c->buf holds the text (free with cap_free). */
static void cap_close(capture *c)
{
    assert_int_equal(ferror(c->f), 0);
    assert_int_equal(fclose(c->f), 0);
    c->f = NULL;
}

static void cap_free(capture *c)
{
    free(c->buf);
    c->buf = NULL;
}

/* Line k (0-based) of text into out (cap bytes), without its "\n".  Fails the
 * test when there is no such line. */
static void line_at(const char *text, size_t k, char *out, size_t cap)
{
    const char *p = text;
    for (size_t i = 0; i < k; i++) {
        p = strchr(p, '\n');
        assert_non_null(p);
        p++;
    }
    const char *e = strchr(p, '\n');
    assert_non_null(e);
    size_t n = (size_t)(e - p);
    assert_true(n < cap);
    memcpy(out, p, n);
    out[n] = '\0';
}

static size_t count_lines(const char *text)
{
    size_t n = 0;
    for (const char *p = text; *p; p++)
        n += *p == '\n';
    return n;
}

/* Splits one CSV row in place into fields (RFC 4180: quoted fields, doubled
 * quotes); an independent reader, not the writer's code.  Returns the count. */
static size_t split(char *row, char **f, size_t max)
{
    size_t n = 0;
    char *p = row;
    for (;;) {
        assert_true(n < max);
        char *w = p;
        f[n++] = w;
        if (*p == '"') {
            p++;
            for (;;) {
                assert_true(*p != '\0'); /* unterminated quote */
                if (p[0] == '"' && p[1] == '"') {
                    *w++ = '"';
                    p += 2;
                } else if (*p == '"') {
                    p++;
                    break;
                } else {
                    *w++ = *p++;
                }
            }
            assert_true(*p == ',' || *p == '\0');
        } else {
            while (*p && *p != ',')
                *w++ = *p++;
        }
        int more = *p == ',';
        *w = '\0';
        if (!more)
            return n;
        p++;
    }
}

/* A field that must hold a finite number; returns it. */
static double num(const char *field)
{
    char *end;
    assert_true(field[0] != '\0');
    double v = strtod(field, &end);
    assert_true(*end == '\0');
    assert_true(isfinite(v));
    return v;
}

/* |got - want| <= rel |want|: the CSV keeps 10 significant digits (csv.h), so
 * a value parses back within 5e-10 relative; 1e-9 is the contract here. */
static void near(double got, double want, double rel)
{
    if (!(fabs(got - want) <= rel * fabs(want)))
        fail_msg("got %.17g, want %.17g (rel %.3g)", got, want, rel);
}

/* ---- a small model built in C (no case loader) ---- */

#define NL 3

typedef struct {
    hf_model m;
    hf_model_line lines[NL];
    char names[NL][HF_MODEL_MAX_NAME + 8];
    hf_line_state states[NL];
    hf_spread_geom geom[NL];
    double line_tension[NL];
    unsigned char broken[NL];
    hf_spread_result r;
} fixture;

static void fixture_init(fixture *fx, const char *const names[NL])
{
    memset(fx, 0, sizeof *fx);
    fx->m.nlines = NL;
    fx->m.lines = fx->lines;
    for (size_t i = 0; i < NL; i++) {
        snprintf(fx->names[i], sizeof fx->names[i], "%s", names[i]);
        fx->lines[i].name = fx->names[i];
        fx->states[i].status = HF_OK;
        fx->states[i].message = "";
    }
    fx->r.nlines = NL;
    fx->r.states = fx->states;
    fx->r.geom = fx->geom;
    fx->r.line_tension = fx->line_tension;
    fx->r.broken = fx->broken;
    fx->r.failed_line = fx->r.max_tension_line = fx->r.max_utilisation_line = (size_t)-1;
}

static const char *const plain_names[NL] = {"bow-port", "stern,x", "aft"};

/* Line 0 solved (touchdown) with high-entropy values, line 1 broken, line 2
 * failed with a message holding a comma and quotes. */
static void lines_case(fixture *fx)
{
    fixture_init(fx, plain_names);
    hf_line_state *s = &fx->states[0];
    s->regime = HF_LINE_TOUCHDOWN;
    s->h = 612345.6789;
    s->v = 234567.8912;
    s->tension = hypot(s->h, s->v);
    s->anchor_h = 598765.4321;
    s->anchor_v = 1234.56789;
    s->anchor_tension = hypot(s->anchor_h, s->anchor_v);
    s->anchor_angle = atan2(s->anchor_v, s->anchor_h);
    s->grounded = 317.48213;
    s->touchdown_x = 402.91735;
    s->max_utilisation = 0.1337428519;
    fx->geom[0].x = 811.230457;
    fx->geom[0].z = 93.7182;
    fx->line_tension[0] = 655321.0987;
    fx->broken[1] = 1;
    fx->states[1].message = "broken";
    fx->states[2].status = HF_ENOCONV;
    fx->states[2].message = "no root, \"slack\" branch";
    fx->states[2].tension = 1.0e99; /* must not be written: the line failed */
}

/* ---- tests ---- */

/* Column names as documented for the commands (docs/spread.md section 6,
 * docs/criteria.md) and fixed by the issues: exact strings. */
static void test_headers_exact(void **state)
{
    (void)state;
    static const char *const names[NL] = {"north", "south-east", "w_3"};
    fixture fx;
    fixture_init(&fx, names);
    capture c;
    char row[4096];

    cap_open(&c);
    assert_int_equal(hf_results_lines_write(c.f, &fx.m, &fx.r), 0);
    cap_close(&c);
    line_at(c.buf, 0, row, sizeof row);
    assert_string_equal(row, "line,status,fairlead_tension_kN,fairlead_horizontal_kN,"
                             "fairlead_vertical_kN,top_angle_deg,anchor_tension_kN,"
                             "anchor_vertical_kN,anchor_uplift_deg,grounded_m,span_m,"
                             "max_utilisation,height_m,anchor_horizontal_kN,touchdown_m,"
                             "max_tension_kN,alert");
    assert_int_equal(count_lines(c.buf), 1 + NL);
    cap_free(&c);

    double K[6][6] = {{0}}, F[6] = {0};
    cap_open(&c);
    assert_int_equal(hf_results_stiffness_write(c.f, K, F), 0);
    cap_close(&c);
    line_at(c.buf, 0, row, sizeof row);
    assert_string_equal(row, "row,surge,sway,heave,roll,pitch,yaw");
    line_at(c.buf, 1, row, sizeof row);
    assert_string_equal(row, "surge,0,0,0,0,0,0");
    line_at(c.buf, 6, row, sizeof row);
    assert_string_equal(row, "yaw,0,0,0,0,0,0");
    line_at(c.buf, 7, row, sizeof row);
    assert_string_equal(row, "static_load,0,0,0,0,0,0");
    assert_int_equal(count_lines(c.buf), 8);
    cap_free(&c);

    hf_error err;
    hf_error_clear(&err);
    cap_open(&c);
    assert_int_equal(hf_results_curve_header_write(c.f, &fx.m, &err), HF_OK);
    cap_close(&c);
    assert_string_equal(c.buf, "offset_m,restoring_kN,force_x_kN,force_y_kN,moment_z_kNm,"
                               "stiffness_kN_per_m,max_tension_kN,max_tension_line,"
                               "max_utilisation,T_north_kN,T_south-east_kN,T_w_3_kN,alert\n");
    cap_free(&c);

    cap_open(&c);
    assert_int_equal(hf_results_balance_header_write(c.f, &fx.m, &err), HF_OK);
    cap_close(&c);
    assert_string_equal(c.buf,
                        "load,condition,water_level_m,status,surge_m,sway_m,yaw_deg,"
                        "max_tension_kN,max_tension_line,max_utilisation,criterion,passed,"
                        "Tmax_north_kN,Tmax_south-east_kN,Tmax_w_3_kN,anchor_load_north_kN,"
                        "anchor_load_south-east_kN,anchor_load_w_3_kN,angle_north_deg,"
                        "angle_south-east_deg,angle_w_3_deg,sliding_north,sliding_south-east,"
                        "sliding_w_3,uplift_north,uplift_south-east,uplift_w_3,horizontal_m,"
                        "max_utilisation_line,min_line_factor,required_line_factor,message,"
                        "alert\n");
    cap_free(&c);
}

static void test_lines_rows_parse_back(void **state)
{
    (void)state;
    fixture fx;
    lines_case(&fx);
    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_lines_write(c.f, &fx.m, &fx.r), 0);
    cap_close(&c);
    assert_int_equal(count_lines(c.buf), 1 + NL);
    char row[4096], *f[64];

    line_at(c.buf, 1, row, sizeof row);
    assert_int_equal(split(row, f, 64), HF_RESULTS_LINES_COLUMNS);
    const hf_line_state *s = &fx.states[0];
    assert_string_equal(f[0], "bow-port");
    assert_string_equal(f[1], "touchdown");
    near(num(f[2]), s->tension / 1e3, 1e-9);
    near(num(f[3]), s->h / 1e3, 1e-9);
    near(num(f[4]), s->v / 1e3, 1e-9);
    /* Classical identity: tan(top angle) = V / H at the fairlead. */
    near(tan(num(f[5]) * M_PI / 180.0), s->v / s->h, 1e-8);
    near(num(f[6]), s->anchor_tension / 1e3, 1e-9);
    near(num(f[7]), s->anchor_v / 1e3, 1e-9);
    near(tan(num(f[8]) * M_PI / 180.0), s->anchor_v / s->anchor_h, 1e-8);
    near(num(f[9]), s->grounded, 1e-9);
    near(num(f[10]), fx.geom[0].x, 1e-9);
    near(num(f[11]), s->max_utilisation, 1e-9);
    near(num(f[12]), fx.geom[0].z, 1e-9);
    near(num(f[13]), s->anchor_h / 1e3, 1e-9);
    near(num(f[14]), s->touchdown_x, 1e-9);
    near(num(f[15]), fx.line_tension[0] / 1e3, 1e-9);
    assert_string_equal(f[16], ""); /* utilisation 0.13: not overloaded */

    /* A name with a comma comes back whole (RFC 4180 quoting). */
    line_at(c.buf, 2, row, sizeof row);
    assert_int_equal(split(row, f, 64), HF_RESULTS_LINES_COLUMNS);
    assert_string_equal(f[0], "stern,x");
    assert_string_equal(f[1], "broken");
    for (int k = 2; k < HF_RESULTS_LINES_COLUMNS; k++)
        assert_string_equal(f[k], "");

    line_at(c.buf, 3, row, sizeof row);
    assert_int_equal(split(row, f, 64), HF_RESULTS_LINES_COLUMNS);
    assert_string_equal(f[0], "aft");
    assert_string_equal(f[1], "failed: no root, \"slack\" branch");
    for (int k = 2; k < HF_RESULTS_LINES_COLUMNS; k++)
        assert_string_equal(f[k], "");
    cap_free(&c);

    /* The helpers the tables use agree with the CSV. */
    char buf[64];
    assert_string_equal(hf_results_line_status(&fx.r, 2, buf, sizeof buf),
                        "failed: no root, \"slack\" branch");
    assert_int_equal(hf_results_line_solved(&fx.r, 0), 1);
    assert_int_equal(hf_results_line_solved(&fx.r, 1), 0);
    assert_int_equal(hf_results_line_solved(&fx.r, 2), 0);
    fx.states[2].message = NULL;
    assert_string_equal(hf_results_line_status(&fx.r, 2, buf, sizeof buf),
                        "failed: no convergence");
    assert_string_equal(hf_results_line_name(&fx.m, 0), "bow-port");
    assert_string_equal(hf_results_line_name(&fx.m, NL), "-");
    assert_string_equal(hf_results_line_name(&fx.m, (size_t)-1), "-");
}

/* NaN and infinities are never written as numbers: the field is empty and
 * the writer says how many there were. */
static void test_lines_nonfinite_counted(void **state)
{
    (void)state;
    fixture fx;
    lines_case(&fx);
    fx.states[0].tension = NAN;
    fx.states[0].touchdown_x = strtod("1e309", NULL); /* overflows to +inf */
    fx.geom[0].z = -INFINITY;
    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_lines_write(c.f, &fx.m, &fx.r), 3);
    cap_close(&c);
    assert_null(strstr(c.buf, "nan"));
    assert_null(strstr(c.buf, "inf"));
    char row[4096], *f[64];
    line_at(c.buf, 1, row, sizeof row);
    assert_int_equal(split(row, f, 64), HF_RESULTS_LINES_COLUMNS);
    assert_string_equal(f[2], "");
    assert_string_equal(f[12], "");
    assert_string_equal(f[14], "");
    near(num(f[3]), fx.states[0].h / 1e3, 1e-9);
    cap_free(&c);
}

/* Overload is a state (issue 13): utilisation >= 1 marks the line
 * "overloaded" in the alert column, exactly at 1 included; a line that did
 * not solve is never marked. */
static void test_lines_alert_overloaded(void **state)
{
    (void)state;
    fixture fx;
    lines_case(&fx);
    assert_int_equal(hf_results_first_overloaded(&fx.r), (size_t)-1);
    fx.states[0].max_utilisation = 1.0;
    fx.states[2].max_utilisation = 5.0; /* failed line: no mark */
    assert_int_equal(hf_results_line_overloaded(&fx.r, 0), 1);
    assert_int_equal(hf_results_line_overloaded(&fx.r, 2), 0);
    assert_int_equal(hf_results_first_overloaded(&fx.r), 0);
    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_lines_write(c.f, &fx.m, &fx.r), 0);
    cap_close(&c);
    char row[4096], *f[64];
    line_at(c.buf, 1, row, sizeof row);
    assert_int_equal(split(row, f, 64), HF_RESULTS_LINES_COLUMNS);
    assert_string_equal(f[16], "overloaded");
    line_at(c.buf, 3, row, sizeof row);
    assert_int_equal(split(row, f, 64), HF_RESULTS_LINES_COLUMNS);
    assert_string_equal(f[16], "");
    cap_free(&c);
    fx.states[0].max_utilisation = nextafter(1.0, 0.0);
    assert_int_equal(hf_results_line_overloaded(&fx.r, 0), 0);
}

static void test_stiffness_parse_back(void **state)
{
    (void)state;
    double K[6][6], F[6];
    for (int i = 0; i < 6; i++) {
        for (int j = 0; j < 6; j++)
            K[i][j] = (i == j ? 407227.318 : -3719.4517) * (1.0 + 0.1377 * i - 0.0419 * j) *
                      pow(10.0, (i >= 3) + (j >= 3));
        F[i] = (i % 2 ? -1.0 : 1.0) * 28465.193 * (i + 0.731);
    }
    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_stiffness_write(c.f, K, F), 0);
    cap_close(&c);
    static const char *const rows[7] = {"surge", "sway", "heave",      "roll",
                                        "pitch", "yaw",  "static_load"};
    char row[4096], *f[16];
    for (int i = 0; i < 7; i++) {
        line_at(c.buf, (size_t)i + 1, row, sizeof row);
        assert_int_equal(split(row, f, 16), 7);
        assert_string_equal(f[0], rows[i]);
        for (int j = 0; j < 6; j++)
            near(num(f[j + 1]), (i < 6 ? K[i][j] : F[j]) / 1e3, 1e-9);
    }
    cap_free(&c);

    K[2][3] = NAN;
    F[4] = -INFINITY;
    cap_open(&c);
    assert_int_equal(hf_results_stiffness_write(c.f, K, F), 2);
    cap_close(&c);
    line_at(c.buf, 3, row, sizeof row);
    split(row, f, 16);
    assert_string_equal(f[4], "");
    line_at(c.buf, 7, row, sizeof row);
    split(row, f, 16);
    assert_string_equal(f[5], "");
    cap_free(&c);
}

/* Curve rows: every value of a point in its column and unit (kN, kN m,
 * kN/m), the line name from its index, each line's fairlead tension; a
 * failed point is its offset and empty fields; a NaN value is left empty and
 * counted.  (The curve's physics is tested in test_analysis.c.) */
static void test_curve_rows(void **state)
{
    (void)state;
    fixture fx;
    fixture_init(&fx, plain_names);
    hf_error err;
    hf_analysis_curve *cv = hf_analysis_curve_alloc(&fx.m, 3, &err);
    assert_non_null(cv);
    double v[8] = {-7.25,     93412.771,  -84512.337, 23157.481,
                   -1.7723e6, 407227.318, 912345.678, 0.2271893};
    for (size_t k = 0; k < 3; k++) {
        cv->status[k] = HF_OK;
        cv->offset[k] = v[0] + (double)k;
        cv->restoring[k] = v[1];
        cv->force_x[k] = v[2];
        cv->force_y[k] = v[3];
        cv->moment_z[k] = v[4];
        cv->stiffness[k] = v[5];
        cv->max_tension[k] = v[6];
        cv->max_tension_line[k] = 2;
        cv->max_utilisation[k] = v[7];
        for (size_t i = 0; i < NL; i++)
            cv->fairlead_tension[k * NL + i] = 512345.25 + 13771.3 * (double)i;
    }
    cv->status[1] = HF_ENOCONV;
    cv->offset[1] = 12.5;
    cv->max_tension_line[2] = (size_t)-1;
    cv->moment_z[2] = NAN;
    cv->max_utilisation[2] = 1.0; /* overloaded exactly at T = MBL */
    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_curve_row_write(c.f, &fx.m, cv, 0), 0);
    assert_int_equal(hf_results_curve_row_write(c.f, &fx.m, cv, 1), 0);
    assert_int_equal(hf_results_curve_row_write(c.f, &fx.m, cv, 2), 1);
    cap_close(&c);
    char row[4096], *f[32];
    line_at(c.buf, 0, row, sizeof row);
    assert_int_equal(split(row, f, 32), HF_RESULTS_CURVE_FIXED + NL + 1);
    near(num(f[0]), -7.25, 1e-9);
    for (int j = 1; j <= 6; j++)
        near(num(f[j]), v[j] / 1e3, 1e-9);
    assert_string_equal(f[7], "aft");
    near(num(f[8]), v[7], 1e-9);
    for (size_t i = 0; i < NL; i++)
        near(num(f[9 + i]), (512345.25 + 13771.3 * (double)i) / 1e3, 1e-9);
    assert_string_equal(f[9 + NL], ""); /* utilisation 0.227 */
    /* A failed offset: the offset, then every field empty. */
    line_at(c.buf, 1, row, sizeof row);
    assert_string_equal(row, "12.5,,,,,,,,,,,,");
    line_at(c.buf, 2, row, sizeof row);
    assert_int_equal(split(row, f, 32), HF_RESULTS_CURVE_FIXED + NL + 1);
    assert_string_equal(f[4], "");
    assert_string_equal(f[7], "");
    assert_string_equal(f[9 + NL], "overloaded");
    assert_int_equal(hf_results_curve_overloaded(cv, 2), 1);
    assert_int_equal(hf_results_curve_overloaded(cv, 0), 0);
    cv->max_utilisation[1] = 3.0; /* a failed point is never marked */
    assert_int_equal(hf_results_curve_overloaded(cv, 1), 0);
    cap_free(&c);
    hf_analysis_curve_free(cv);
}

static void test_balance_rows(void **state)
{
    (void)state;
    fixture fx;
    fixture_init(&fx, plain_names);
    /* Input factors only (the writer copies them): MBL/T 1.67 intact and
     * 1.25 one line broken, the quasi-static factors of API RP 2SK (3rd
     * ed., 2005), from memory. */
    fx.m.criteria.factor_intact = 1.67;
    fx.m.criteria.factor_damaged = 1.25;
    hf_load load;
    memset(&load, 0, sizeof load);
    char lname[] = "gale \"north\"";
    load.name = lname;
    double tension[NL] = {734512.875, 0.0, 421987.3125};
    hf_line_criterion lc[NL];
    memset(lc, 0, sizeof lc);
    lc[0].has_factor = 1;
    lc[0].factor = 11.5732;
    lc[2].has_factor = 1;
    lc[2].factor = 7.9183;

    /* anchors: line 0 a gravity block sliding and lifting, line 1 (broken in
     * `bad`) a drag anchor, line 2 a pile */
    hf_anchor_criterion ac[NL];
    memset(ac, 0, sizeof ac);
    ac[0].kind = HF_ANCHOR_GRAVITY;
    ac[0].load = 612873.5;
    ac[0].angle = 0.2183;
    ac[0].has_sliding = ac[0].has_uplift = 1;
    ac[0].sliding_factor = 0.6083;
    ac[0].uplift_factor = 3.917;
    ac[1].kind = HF_ANCHOR_DRAG;
    ac[2].kind = HF_ANCHOR_PILE;
    ac[2].load = 401234.75;
    ac[2].angle = 0.3127;
    fx.m.site.water_level = 2.375;

    hf_balance_result ok;
    memset(&ok, 0, sizeof ok);
    ok.anchor = ac;
    ok.status = HF_OK;
    ok.broken = HF_BALANCE_NONE;
    ok.offset[0] = 3.918274;
    ok.offset[1] = -1.2740913;
    ok.offset[2] = 0.0123457;
    ok.horizontal = hypot(ok.offset[0], ok.offset[1]);
    ok.nlines = NL;
    ok.tension = tension;
    ok.line = lc;
    ok.max_tension = tension[0];
    ok.max_tension_line = 0;
    ok.max_utilisation = 0.0864061;
    ok.max_utilisation_line = 2;
    ok.passed = 1;
    ok.criterion = HF_CRIT_LINE;
    ok.criterion_line = 0;

    hf_balance_result bad;
    memset(&bad, 0, sizeof bad);
    bad.status = HF_ENOEQUIL;
    bad.broken = 1;
    bad.nlines = NL;
    bad.tension = tension;
    bad.line = lc;
    bad.anchor = ac;
    bad.max_tension_line = bad.max_utilisation_line = bad.criterion_line = HF_BALANCE_NONE;
    bad.criterion = HF_CRIT_EQUILIBRIUM;
    snprintf(bad.message, sizeof bad.message, "load %s, beyond the spread", "too large");

    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_balance_row_write(c.f, &fx.m, &load, &ok), 0);
    assert_int_equal(hf_results_balance_row_write(c.f, &fx.m, &load, &bad), 0);
    cap_close(&c);
    size_t ncol =
        HF_RESULTS_BALANCE_HEAD + NL * (1 + HF_RESULTS_BALANCE_ANCHOR) + HF_RESULTS_BALANCE_TAIL;
    /* the fields after the per-line groups */
    size_t T = HF_RESULTS_BALANCE_HEAD + NL * (1 + HF_RESULTS_BALANCE_ANCHOR);
    char row[4096], *f[64];
    line_at(c.buf, 0, row, sizeof row);
    assert_int_equal(split(row, f, 64), ncol);
    assert_string_equal(f[0], "gale \"north\"");
    assert_string_equal(f[1], "intact");
    near(num(f[2]), 2.375, 1e-12); /* the model's still water level */
    assert_string_equal(f[3], "ok");
    near(num(f[4]), ok.offset[0], 1e-9);
    near(num(f[5]), ok.offset[1], 1e-9);
    near(num(f[6]) * M_PI / 180.0, ok.offset[2], 1e-9);
    near(num(f[7]), tension[0] / 1e3, 1e-9);
    assert_string_equal(f[8], "bow-port");
    near(num(f[9]), ok.max_utilisation, 1e-9);
    assert_string_equal(f[10], "line_factor:bow-port");
    assert_string_equal(f[11], "1");
    near(num(f[12]), tension[0] / 1e3, 1e-9);
    assert_string_equal(f[13], "0"); /* a line carrying nothing: 0 kN, a number */
    near(num(f[14]), tension[2] / 1e3, 1e-9);
    /* anchor groups: load kN, angle deg, sliding, uplift (gravity only) */
    near(num(f[15]), 612.8735, 1e-9);
    assert_string_equal(f[16], "0"); /* the drag anchor: no load, a number */
    near(num(f[17]), 401.23475, 1e-9);
    near(num(f[18]) * M_PI / 180.0, 0.2183, 1e-9);
    near(num(f[20]) * M_PI / 180.0, 0.3127, 1e-9);
    near(num(f[21]), 0.6083, 1e-12);
    assert_string_equal(f[22], ""); /* drag anchor: no sliding factor */
    assert_string_equal(f[23], ""); /* pile: none either */
    near(num(f[24]), 3.917, 1e-12);
    assert_string_equal(f[25], "");
    assert_string_equal(f[26], "");
    near(num(f[T]), ok.horizontal, 1e-9);
    assert_string_equal(f[T + 1], "aft");
    near(num(f[T + 2]), 7.9183, 1e-9); /* the smaller of the two factors */
    near(num(f[T + 3]), 1.67, 1e-9);
    assert_string_equal(f[T + 4], "");
    assert_string_equal(f[T + 5], ""); /* no overload */

    line_at(c.buf, 1, row, sizeof row);
    assert_int_equal(split(row, f, 64), ncol);
    assert_string_equal(f[1], "broken:stern,x");
    assert_string_equal(f[3], "no equilibrium");
    for (int k = 4; k <= 9; k++)
        assert_string_equal(f[k], "");
    assert_string_equal(f[10], "equilibrium");
    assert_string_equal(f[11], "0");
    for (size_t k = 12; k < T + 3; k++)
        assert_string_equal(f[k], "");
    near(num(f[T + 3]), 1.25, 1e-9);
    assert_string_equal(f[T + 4], "load too large, beyond the spread");
    assert_string_equal(f[T + 5], "");
    cap_free(&c);

    /* No factor checked: the required factor is empty; a NaN is counted. */
    fx.m.criteria.factor_intact = 0.0;
    ok.offset[1] = NAN;
    cap_open(&c);
    assert_int_equal(hf_results_balance_row_write(c.f, &fx.m, &load, &ok), 1);
    cap_close(&c);
    line_at(c.buf, 0, row, sizeof row);
    split(row, f, 64);
    assert_string_equal(f[5], "");
    assert_string_equal(f[T + 3], "");
    assert_true(hf_results_balance_min_factor(&bad) == 7.9183);
    lc[0].has_factor = lc[2].has_factor = 0;
    assert_true(hf_results_balance_min_factor(&bad) == 0.0);
    cap_free(&c);
}

/* A line name longer than the case loader allows cannot make a column name:
 * HF_ELIMIT and nothing written (not a cut name). */
static void test_long_name_refused(void **state)
{
    (void)state;
    fixture fx;
    fixture_init(&fx, plain_names);
    static char longname[HF_MODEL_MAX_NAME + 2];
    memset(longname, 'q', sizeof longname - 1);
    longname[sizeof longname - 1] = '\0';
    fx.lines[1].name = longname;
    hf_error err;
    hf_error_clear(&err);
    capture c;
    cap_open(&c);
    assert_int_equal(hf_results_curve_header_write(c.f, &fx.m, &err), HF_ELIMIT);
    assert_int_equal(hf_results_balance_header_write(c.f, &fx.m, &err), HF_ELIMIT);
    cap_close(&c);
    assert_int_equal(c.len, 0);
    assert_non_null(strstr(err.text, "HF_MODEL_MAX_NAME"));
    cap_free(&c);
    /* Exactly the limit is fine. */
    longname[HF_MODEL_MAX_NAME] = '\0';
    cap_open(&c);
    assert_int_equal(hf_results_curve_header_write(c.f, &fx.m, &err), HF_OK);
    cap_close(&c);
    assert_non_null(strstr(c.buf, longname));
    cap_free(&c);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_headers_exact),
        cmocka_unit_test(test_lines_rows_parse_back),
        cmocka_unit_test(test_lines_nonfinite_counted),
        cmocka_unit_test(test_lines_alert_overloaded),
        cmocka_unit_test(test_stiffness_parse_back),
        cmocka_unit_test(test_curve_rows),
        cmocka_unit_test(test_balance_rows),
        cmocka_unit_test(test_long_name_refused),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
