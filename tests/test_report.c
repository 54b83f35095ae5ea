/* test_report.c - HTML report: well-formed, self-contained, complete, honest verdicts. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <cmocka.h>
#include "support.h"
#include "xml_check.h"
#include "holdfast/alloc.h"
#include "holdfast/case.h"
#include "holdfast/cli.h"
#include "holdfast/report.h"
#include "holdfast/spread.h"
#include "holdfast/svg.h"

static size_t count(const char *s, const char *what)
{
    size_t n = 0;
    for (const char *p = strstr(s, what); p; p = strstr(p + 1, what))
        n++;
    return n;
}

/* A small fictional case: a pontoon at the invented Port Ellery. */
static const char case_text[] =
    "title: \"Test <pontoon> & \\\"quay\\\" of the invented Port Ellery\"\n"
    "site:\n"
    "  depth: 12.5 m\n"
    "components:\n"
    "  chain-a: {type: studless_chain, grade: R3, diameter: 38 mm}\n"
    "hull:\n"
    "  position: [0, 0]\n"
    "  heading: 0 deg\n"
    "  outline: [[9, 7], [-9, 7], [-9, -7], [9, -7]]\n"
    "lines:\n"
    "  - name: north\n"
    "    anchor: [0, 95.3]\n"
    "    fairlead: [0, 6.0, -0.5]\n"
    "    sections:\n"
    "      - {component: chain-a, length: 93.5 m}\n"
    "  - name: south\n"
    "    anchor: [0, -95.3]\n"
    "    fairlead: [0, -6.0, -0.5]\n"
    "    sections:\n"
    "      - {component: chain-a, length: 50 m}\n"
    "      - {clump: 15 kN}\n"
    "      - {component: chain-a, length: 43.5 m}\n"
    "  - name: east\n"
    "    anchor: [97.1, 0]\n"
    "    fairlead: [8.0, 0, -0.5]\n"
    "    sections:\n"
    "      - {component: chain-a, length: 93.5 m}\n"
    "loads:\n"
    "  - name: gale\n"
    "    force: 35 kN\n"
    "    direction: 250 deg\n"
    "criteria:\n"
    "  preset: api-rp-2sk\n";

static void load_case(hf_model *m)
{
    hf_error err;
    hf_model_init(m);
    hf_status s = hf_case_load_buffer(case_text, strlen(case_text), "ellery.yaml", m, &err);
    if (s != HF_OK)
        print_error("%s\n", err.text);
    assert_int_equal(s, HF_OK);
}

/* A whole report as `holdfast run` would stream it: every part of the API. */
static char *write_report(hf_model *m, int fail_one, hf_report *r)
{
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_error err;
    hf_report_begin(r, f, m, "holdfast run ellery.yaml --out results");
    hf_report_section(r, "Lines at rest", "Every line solved with the hull at rest.");
    hf_spread *ws = hf_spread_alloc(m, &err);
    assert_non_null(ws);
    hf_pose pose;
    hf_spread_pose_rest(m, &pose);
    hf_spread_result res;
    assert_int_equal(hf_spread_solve(ws, &pose, &res, &err), HF_OK);
    static const char *const cols[] = {"line", "fairlead tension (kN)", "utilisation (-)",
                                       "note <&>"};
    hf_report_table_begin(r, "Tensions & utilisation", cols, 4);
    for (size_t i = 0; i < m->nlines; i++) {
        char t[32], u[32];
        hf_report_number(t, sizeof t, res.states[i].tension / 1e3, 4);
        hf_report_number(u, sizeof u, res.states[i].max_utilisation, 3);
        const char *cells[4] = {m->lines[i].name, t, u, i == 1 ? "clump \"A\" < 20 kN" : NULL};
        hf_report_table_row(r, cells);
    }
    hf_report_table_end(r);
    hf_report_table_begin(r, NULL, cols, 3);
    double v[2] = {2.38512345, NAN};
    hf_report_table_row_numbers(r, "numbers", v, 3);
    hf_report_table_end(r);
    for (size_t i = 0; i < m->nlines; i++) {
        FILE *fig = hf_report_figure_begin(r);
        assert_int_equal(hf_report_svg_elevation(fig, m, i, &res.states[i], 0, &err), HF_OK);
        hf_report_figure_end(r, "Elevation & tension of one line.");
    }
    FILE *fig = hf_report_figure_begin(r);
    assert_int_equal(hf_report_svg_plan(fig, m, NULL, NULL, &m->loads[0], 0, &err), HF_OK);
    hf_report_figure_end(r, "Plan.");
    hf_report_section(r, "Criteria", NULL);
    for (size_t i = 0; i < m->nlines; i++) {
        char item[64], req[64], got[32];
        snprintf(item, sizeof item, "line %s, intact", m->lines[i].name);
        snprintf(req, sizeof req, "MBL/T at least %.3g", m->criteria.factor_intact);
        double fac = 1.0 / res.states[i].max_utilisation;
        hf_report_number(got, sizeof got, fac, 3);
        hf_report_check(r, item, req, got,
                        !(fail_one && i == 2) && fac >= m->criteria.factor_intact);
    }
    hf_report_note(r, "warning", "Anchor <uplift> & drag: see the anchor table.");
    hf_report_paragraph(r, "Plain words & <brackets>.");
    assert_int_equal(hf_report_end(r, &err), HF_OK);
    hf_spread_free(ws);
    char *s = hf_test_stream_read(f, 1);
    fclose(f);
    return s;
}

static void test_report_complete_and_well_formed(void **state)
{
    (void)state;
    hf_model m;
    load_case(&m);
    hf_report r;
    char *html = write_report(&m, 0, &r);
    /* HF_REPORT_DUMP=FILE keeps this report, e.g. to render it with
     * scripts/render-report.sh and look at it */
    const char *dump = getenv("HF_REPORT_DUMP");
    if (dump) {
        FILE *d = fopen(dump, "w");
        assert_non_null(d);
        fputs(html, d);
        fclose(d);
    }
    hf_test_assert_xml(html);
    /* the case summary, components with sources, lines, results, figures */
    assert_non_null(strstr(html, "<!DOCTYPE html>"));
    assert_non_null(strstr(html, "Test &lt;pontoon&gt; &amp; &quot;quay&quot;"));
    assert_non_null(strstr(html, "<h2>Case</h2>"));
    assert_non_null(strstr(html, "<h2>Components</h2>"));
    assert_non_null(strstr(html, "IACS UR W22")); /* the MBL formula's source, from component.c */
    assert_non_null(strstr(html, "<h2>Lines</h2>"));
    assert_non_null(strstr(html, "chain-a 50 m + clump 15 kN + chain-a 43.5 m"));
    assert_non_null(strstr(html, "api-rp-2sk"));
    assert_non_null(strstr(html, "Tensions &amp; utilisation"));
    assert_non_null(strstr(html, "clump &quot;A&quot; &lt; 20 kN"));
    assert_non_null(strstr(html, "<td class=\"num\">2.39</td><td class=\"num\">-</td>"));
    assert_int_equal(count(html, "<svg "), 4);
    assert_int_equal(count(html, "<figure>"), 4);
    assert_non_null(strstr(html, "Figure 4. </b>Plan."));
    assert_non_null(strstr(html, "gale: 35 kN"));
    /* the safety caution, at the top and at the end */
    char first_line[256];
    const char *nl = strchr(hf_cli_caution, '\n');
    size_t n = (size_t)(nl - hf_cli_caution);
    memcpy(first_line, hf_cli_caution, n);
    first_line[n] = '\0';
    assert_int_equal(count(html, first_line), 2);
    /* the verdict in plain words */
    assert_int_equal(r.nchecks, 3);
    assert_int_equal(r.nfailed, 0);
    /* checks that record no scope cover none of the case's load cases: the
     * banner may not be green (issue 13 item 4) */
    assert_non_null(strstr(html, "<div class=\"verdict partial\">All 3 criteria checks passed, "
                                 "but they cover less than the case declares"));
    assert_non_null(strstr(html, "1 load case not checked"));
    assert_null(strstr(html, "verdict ok"));
    assert_int_equal(count(html, ">PASS<"), 3);
    assert_int_equal(count(html, ">FAIL<"), 0);
    /* self-contained: no script, no external resource, nothing fetched */
    assert_null(strstr(html, "<script"));
    assert_null(strstr(html, "src="));
    assert_null(strstr(html, "href="));
    assert_null(strstr(html, "@import"));
    assert_null(strstr(html, "url("));
    assert_int_equal(count(html, "http"), count(html, "xmlns=\"http://www.w3.org/2000/svg\""));
    free(html);
    hf_model_free(&m);
}

/* The banner states its scope (issue 13 item 4): green only when the checks
 * cover every load case, still water level and condition the case declares;
 * amber when they passed over less, naming what was left out. */
static char *scoped_report(hf_model *m, size_t nconds, int fail)
{
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_report r;
    hf_report_begin(&r, f, m, "holdfast run ellery.yaml");
    hf_report_section(&r, "Mean position under load", NULL);
    for (size_t c = 0; c < nconds; c++) {
        char item[64];
        snprintf(item, sizeof item, "load gale, condition %zu", c);
        hf_report_check(&r, item, "MBL/T at least 2", "4.2", !(fail && c == 1));
        hf_report_scope_add(&r, 0, c, m->site.water_level);
    }
    hf_report_scope_add(&r, 7, 0, 0.0); /* out of range: ignored, scope marked incomplete */
    assert_int_equal(r.scope_lost, 1);
    r.scope_lost = 0; /* (undo, to test the counts alone) */
    assert_int_equal(hf_report_end(&r, NULL), HF_OK);
    assert_null(r.scope_load); /* freed by the end */
    char *html = hf_test_stream_read(f, 1);
    fclose(f);
    hf_test_assert_xml(html);
    return html;
}

static void test_report_verdict_scope(void **state)
{
    (void)state;
    hf_model m;
    load_case(&m);
    double lv[4];
    assert_int_equal(hf_report_levels_declared(&m, lv, 4), 1);
    assert_true(lv[0] == m.site.water_level);
    /* every condition of the one load case at the one level: green, with the scope */
    char *html = scoped_report(&m, 4, 0);
    assert_non_null(strstr(html, "<div class=\"verdict ok\">All 4 criteria checks passed, "
                                 "covering everything the case declares."));
    assert_non_null(strstr(html, "1 of 1 load case \xc3\x97 1 of 1 still water level (0 m above "
                                 "datum) \xc3\x97 4 of 4 conditions (intact and each of the 3 "
                                 "lines broken)"));
    assert_non_null(strstr(html, "MBL/T at least 2 intact and 1.43 with one line broken "
                                 "(api-rp-2sk)"));
    assert_non_null(strstr(html, "no offset limit"));
    free(html);
    /* the intact condition only: amber, and what is missing is said */
    html = scoped_report(&m, 1, 0);
    assert_null(strstr(html, "verdict ok"));
    assert_non_null(strstr(html, "<div class=\"verdict partial\">All 1 criteria check passed, "
                                 "but they cover less"));
    assert_non_null(strstr(html, "1 of 4 conditions"));
    assert_non_null(strstr(html, "3 conditions (intact or a line broken) not checked"));
    free(html);
    /* a failure is red whatever the scope, and the scope is still stated */
    html = scoped_report(&m, 4, 1);
    assert_non_null(strstr(html, "<div class=\"verdict bad\">1 of 4 criteria checks FAILED."));
    assert_non_null(strstr(html, "4 of 4 conditions"));
    free(html);
    /* checks of something else (a design study's conditions) count once
     * they say what they covered; otherwise they make the banner amber */
    {
        FILE *f = tmpfile();
        hf_report r;
        hf_report_begin(&r, f, &m, NULL);
        for (size_t c = 0; c < 4; c++) {
            hf_report_check(&r, "load gale", "MBL/T at least 2", "4.2", 1);
            hf_report_scope_add(&r, 0, c, m.site.water_level);
        }
        hf_report_check(&r, "design condition", "offset at most 30 m", "12 m", 1);
        hf_report_check(&r, "design condition", "offset at most 30 m", "14 m", 1);
        hf_report_scope_extra(&r, 2, "the 2 conditions of design study squall");
        assert_int_equal(hf_report_end(&r, NULL), HF_OK);
        html = hf_test_stream_read(f, 1);
        fclose(f);
        hf_test_assert_xml(html);
        assert_non_null(strstr(html, "<div class=\"verdict ok\">All 6 criteria checks passed"));
        assert_non_null(strstr(html, "Also checked: the 2 conditions of design study squall."));
        free(html);
        f = tmpfile();
        hf_report_begin(&r, f, &m, NULL);
        for (size_t c = 0; c < 4; c++) {
            hf_report_check(&r, "load gale", "MBL/T at least 2", "4.2", 1);
            hf_report_scope_add(&r, 0, c, m.site.water_level);
        }
        hf_report_check(&r, "design condition", "offset at most 30 m", "12 m", 1);
        assert_int_equal(hf_report_end(&r, NULL), HF_OK);
        html = hf_test_stream_read(f, 1);
        fclose(f);
        assert_non_null(strstr(html, "verdict partial"));
        assert_non_null(strstr(html, "some checks did not record what they covered."));
        free(html);
    }
    /* a second load case the checks never reach: amber */
    hf_load *nl = hf_realloc(m.loads, 2 * sizeof *nl);
    assert_non_null(nl);
    m.loads = nl;
    m.loads[1] = m.loads[0];
    m.loads[1].name = hf_strdup("swell");
    m.loads[1].drag = NULL;
    m.loads[1].ndrag = 0;
    m.nloads = 2;
    html = scoped_report(&m, 4, 0);
    assert_non_null(strstr(html, "verdict partial"));
    assert_non_null(strstr(html, "1 of 2 load cases"));
    assert_non_null(strstr(html, "1 load case not checked"));
    free(html);
    hf_model_free(&m);
}

/* A fictional pontoon at the invented Gannet Cove: four corner chains of one
 * make-up and geometry (each the others rotated about the vertical), and a
 * tail of chain and spiral strand. */
static const char cove_text[] =
    "title: Gannet Cove pontoon (fictional)\n"
    "site: {depth: 12.5 m}\n"
    "components:\n"
    "  chain-a: {type: studless_chain, grade: R3, diameter: 38 mm}\n"
    "  wire-b: {type: spiral_strand, diameter: 40 mm}\n"
    "lines:\n"
    "  - {name: ne, anchor: [36.87, 31.87], fairlead: [10, 5, -0.5],\n"
    "     sections: [{component: chain-a, length: 40 m}]}\n"
    "  - {name: nw, anchor: [-36.87, 31.87], fairlead: [-10, 5, -0.5],\n"
    "     sections: [{component: chain-a, length: 40 m}]}\n"
    "  - {name: sw, anchor: [-36.87, -31.87], fairlead: [-10, -5, -0.5],\n"
    "     sections: [{component: chain-a, length: 40 m}]}\n"
    "  - {name: se, anchor: [36.87, -31.87], fairlead: [10, -5, -0.5],\n"
    "     sections: [{component: chain-a, length: 40 m}]}\n"
    "  - {name: tail, anchor: [0, -70], fairlead: [0, -5, -0.5],\n"
    "     sections: [{component: chain-a, length: 30 m},\n"
    "                {component: wire-b, length: 40 m}]}\n"
    "criteria: {preset: api-rp-2sk}\n";

/* The distinct y1 of the dash-dot allowed-tension steps of an elevation. */
static size_t allowed_steps(const char *svg, double *y, size_t cap)
{
    size_t n = 0;
    for (const char *p = strstr(svg, "<line "); p; p = strstr(p + 1, "<line ")) {
        const char *end = strchr(p, '>');
        const char *d = strstr(p, "stroke-dasharray=\"8 3 2 3\"");
        const char *y1 = strstr(p, " y1=\""), *x1 = strstr(p, " x1=\""), *x2 = strstr(p, " x2=\"");
        if (!d || d > end || !y1 || y1 > end || !x1 || !x2 || x2 > end)
            continue;
        if (strtod(x2 + 5, NULL) - strtod(x1 + 5, NULL) < 30) /* the key's 26 px sample */
            continue;
        double v = strtod(y1 + 5, NULL);
        size_t k = 0;
        while (k < n && fabs(y[k] - v) > 0.01)
            k++;
        if (k == n && n < cap)
            y[n++] = v;
    }
    return n;
}

/* Issue 13 item 3: identical lines share one elevation, all lines overlay
 * in one, and the allowed tension of each section is drawn. */
static void test_report_elevation_groups(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    assert_int_equal(hf_case_load_buffer(cove_text, strlen(cove_text), "cove.yaml", &m, &err),
                     HF_OK);
    size_t group[5];
    assert_int_equal(hf_report_line_groups(&m, NULL, group), 2);
    for (size_t i = 0; i < 4; i++)
        assert_int_equal(group[i], 0);
    assert_int_equal(group[4], 4);
    /* away from rest the symmetry breaks: a surge offset separates the corners */
    hf_pose pose;
    hf_spread_pose_rest(&m, &pose);
    pose.surge += 2.385;
    assert_int_equal(hf_report_line_groups(&m, &pose, group), 3);
    hf_spread *ws = hf_spread_alloc(&m, &err);
    assert_non_null(ws);
    hf_spread_result res;
    hf_spread_pose_rest(&m, &pose);
    assert_int_equal(hf_spread_solve(ws, &pose, &res, &err), HF_OK);
    /* the four corners drawn once */
    size_t idx[4] = {0, 1, 2, 3};
    FILE *f = tmpfile();
    assert_int_equal(hf_report_svg_elevation_group(f, &m, idx, 4, &res.states[0], 1, &err), HF_OK);
    char *svg = hf_test_stream_read(f, 1);
    fclose(f);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, "Drawn once for 4 lines of the same make-up and geometry: ne, "
                                "nw, sw, se"));
    double y[8];
    assert_int_equal(allowed_steps(svg, y, 8), 1); /* one chain: one allowed tension */
    /* chain R3 38 mm: MBL = 0.0223 d^2 (44 - 0.08 d) kN = 1318.96 kN (IACS UR W22 /
     * DNV-OS-E302 form), allowed MBL / 2.00 (API RP 2SK intact, from memory) */
    double mbl = 0.0223 * 38 * 38 * (44 - 0.08 * 38);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[0].mbl / 1e3, mbl, 1e-6 * mbl);
    char want[64];
    snprintf(want, sizeof want, ">allowed %.4g kN<", mbl / 2);
    assert_non_null(strstr(svg, want));
    free(svg);
    /* the tail: chain then strand, two different allowed tensions, both drawn */
    f = tmpfile();
    assert_int_equal(hf_report_svg_elevation(f, &m, 4, &res.states[4], 1, &err), HF_OK);
    svg = hf_test_stream_read(f, 1);
    fclose(f);
    hf_test_assert_xml(svg);
    assert_true(m.lines[4].line.sec[0].mbl != m.lines[4].line.sec[1].mbl);
    assert_int_equal(allowed_steps(svg, y, 8), 2);
    assert_true(fabs(y[0] - y[1]) > 1.0);
    free(svg);
    /* every line overlaid in one figure, with a legend of the five names */
    f = tmpfile();
    assert_int_equal(hf_report_svg_elevation_overlay(f, &m, &res, 1, &err), HF_OK);
    svg = hf_test_stream_read(f, 1);
    fclose(f);
    hf_test_assert_xml(svg);
    assert_non_null(strstr(svg, "All lines in their own vertical planes"));
    for (size_t i = 0; i < 5; i++) {
        snprintf(want, sizeof want, ">%s<", m.lines[i].name);
        assert_non_null(strstr(svg, want));
    }
    free(svg);
    /* a group without lines is refused before anything is written */
    f = tmpfile();
    assert_int_equal(hf_report_svg_elevation_group(f, &m, idx, 0, &res.states[0], 1, &err),
                     HF_EINVAL);
    assert_int_equal(ftell(f), 0);
    fclose(f);
    hf_spread_free(ws);
    hf_model_free(&m);
}

static void test_report_failed_check_is_plain(void **state)
{
    (void)state;
    hf_model m;
    load_case(&m);
    hf_report r;
    char *html = write_report(&m, 1, &r);
    hf_test_assert_xml(html);
    assert_int_equal(r.nfailed, 1);
    assert_non_null(strstr(html, "1 of 3 criteria checks FAILED."));
    assert_int_equal(count(html, ">FAIL<"), 1);
    assert_null(strstr(html, "checks passed"));
    free(html);
    hf_model_free(&m);
}

static void test_report_empty_and_no_checks(void **state)
{
    (void)state;
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_report r;
    hf_report_begin(&r, f, NULL, NULL);
    hf_report_table_row(&r, NULL); /* no table open: ignored, page stays valid */
    hf_report_section(&r, "Empty", NULL);
    assert_int_equal(hf_report_end(&r, NULL), HF_OK);
    char *html = hf_test_stream_read(f, 1);
    hf_test_assert_xml(html);
    assert_non_null(strstr(html, "No criteria checks were made."));
    free(html);
    fclose(f);
}

static void test_report_write_error(void **state)
{
    (void)state;
    /* a stream that cannot be written: the error reaches the caller */
    FILE *f = fopen("/dev/null", "r");
    assert_non_null(f);
    hf_report r;
    hf_error err;
    hf_error_clear(&err);
    hf_report_begin(&r, f, NULL, "x");
    assert_int_equal(hf_report_end(&r, &err), HF_EIO);
    assert_non_null(strstr(err.text, "report"));
    fclose(f);
}

/* Numbers for people: significant digits, plain decimals, no "-0". */
static void test_report_number(void **state)
{
    (void)state;
    char b[48];
    static const struct {
        double v;
        int d;
        const char *want;
    } c[] = {
        {2.38512345, 3, "2.39"},
        {1234.5, 3, "1230"},
        {0.0412345, 3, "0.0412"},
        {-812.44, 4, "-812.4"},
        {-0.0004, 3, "-0.0004"},
        {1e-5, 3, "1e-05"},
        {0.0, 4, "0"},
        {-1e-20, 3, "-1e-20"},
        {2.5e9, 3, "2.5e+09"},
        {100.0, 4, "100"},
        {NAN, 4, "-"},
        {-INFINITY, 4, "-"},
        {-0.00049, 1, "-0.0005"},
        {999.96, 4, "1000"},
    };
    for (size_t i = 0; i < sizeof c / sizeof c[0]; i++) {
        hf_report_number(b, sizeof b, c[i].v, c[i].d);
        if (strcmp(b, c[i].want)) {
            print_error("%g at %d digits: got \"%s\", want \"%s\"\n", c[i].v, c[i].d, b, c[i].want);
            fail();
        }
    }
}

/* Allocation failures in the model-aware figures come back as HF_ENOMEM
 * with nothing leaked (alloc.h failure injection). */
static void test_report_figures_enomem(void **state)
{
    (void)state;
    hf_model m;
    load_case(&m);
    for (long k = 1; k <= 5; k++) {
        FILE *f = tmpfile();
        hf_error err;
        hf_alloc_fail_at(k, 0);
        hf_status s = hf_report_svg_plan(f, &m, NULL, NULL, NULL, 1, &err);
        hf_alloc_fail_at(0, 0);
        assert_int_equal(s, HF_ENOMEM);
        fclose(f);
    }
    hf_model_free(&m);
}

/* `holdfast plot` end to end: each figure kind writes a well-formed SVG;
 * usage errors exit 2 and write nothing. */
static void test_cmd_plot(void **state)
{
    (void)state;
    char dir[] = "/tmp/hf_plot_XXXXXX";
    assert_non_null(mkdtemp(dir));
    char casep[64], outp[64];
    snprintf(casep, sizeof casep, "%s/ellery.yaml", dir);
    snprintf(outp, sizeof outp, "%s/fig.svg", dir);
    FILE *f = fopen(casep, "w");
    assert_non_null(f);
    fputs(case_text, f);
    fclose(f);
    static const char *const figs[][8] = {
        {"plot", NULL, "--figure", "plan", "--load", "gale", "--out", NULL},
        {"plot", NULL, "--figure", "elevation", "--line=south", "--out", NULL, NULL},
        {"plot", NULL, "--figure", "curve", "--direction", "90", "--out", NULL},
        {"plot", NULL, "--figure=curve", "--range", "-4:4:0.25", "--out", NULL, NULL},
    };
    static const char *const want[] = {">gale: 35 kN<", "Line south", ">Utilisation of each line<",
                                       ">Stiffness<"};
    for (size_t k = 0; k < 4; k++) {
        char *argv[8];
        int argc = 0;
        for (int i = 0; i < 8; i++) {
            const char *a = figs[k][i];
            if (i == 1)
                a = casep;
            else if (!a && i > 1 && figs[k][i - 1] && !strcmp(figs[k][i - 1], "--out"))
                a = outp;
            if (!a)
                break;
            argv[argc++] = (char *)a;
        }
        remove(outp);
        assert_int_equal(hf_cmd_plot(argc, argv), 0);
        FILE *g = fopen(outp, "r");
        assert_non_null(g);
        fseek(g, 0, SEEK_END);
        char *svg = hf_test_stream_read(g, 1);
        fclose(g);
        hf_test_assert_xml(svg);
        if (!strstr(svg, want[k])) {
            print_error("figure %zu lacks \"%s\"\n", k, want[k]);
            fail();
        }
        free(svg);
    }
    static const char *const bad[][6] = {
        {"plot", NULL, "--figure", "side", "--out", NULL},
        {"plot", NULL, "--figure", "plan", "--line", "north"},
        {"plot", NULL, "--figure", "elevation", "--line", "nowhere"},
        {"plot", NULL, "--figure", "curve", "--range", "0:5:-1"},
        {"plot", NULL, "--out", "x.svg", NULL, NULL},
    };
    for (size_t k = 0; k < 5; k++) {
        char *argv[6];
        int argc = 0;
        for (int i = 0; i < 6; i++) {
            const char *a = i == 1 ? casep : bad[k][i];
            if (!a && i == 5 && bad[k][4] && !strcmp(bad[k][4], "--out"))
                a = outp;
            if (!a)
                break;
            argv[argc++] = (char *)a;
        }
        remove(outp);
        assert_int_equal(hf_cmd_plot(argc, argv), 2);
        assert_null(fopen(outp, "r"));
    }
    remove(outp);
    remove(casep);
    rmdir(dir);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_report_complete_and_well_formed),
        cmocka_unit_test(test_report_failed_check_is_plain),
        cmocka_unit_test(test_report_verdict_scope),
        cmocka_unit_test(test_report_elevation_groups),
        cmocka_unit_test(test_report_empty_and_no_checks),
        cmocka_unit_test(test_report_write_error),
        cmocka_unit_test(test_report_number),
        cmocka_unit_test(test_report_figures_enomem),
        cmocka_unit_test(test_cmd_plot),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
