/* test_cmd_spread.c - end-to-end runs of 'holdfast lines', 'curve' and 'stiffness' ($HF_BIN). */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include "support.h"

static const char *bin; /* $HF_BIN */
#define NEED_BIN() HF_TEST_NEED(bin)
static const char *root; /* $HF_ROOT */
static char dir[256];    /* scratch directory */
static char small[320];  /* small fictional case */
static char buoyed[320]; /* case whose line the model cannot represent */
static char oc3[512];
static char stub[320]; /* 90 m of chain to an anchor 461 m away */

#define OUT_CAP (1 << 18)
static char out[OUT_CAP];

static hf_test_io both = {.out = out, .out_cap = OUT_CAP, .merge = 1}; /* as 2>&1 */
static hf_test_io quiet = {.out = out, .out_cap = OUT_CAP};            /* stderr dropped */

/* Fictional scenario: the work barge "Corrin Vale" on four chains in Quillby
 * Sound (invented place and vessel; numbers invented for the test). */
static const char small_case[] =
    "title: Fictional work barge Corrin Vale, four chains in Quillby Sound\n"
    "site:\n  depth: 42.5 m\n"
    "components:\n"
    "  ch: {type: custom, wet_weight: 1.137 kN/m, axial_stiffness: 612 MN,\n"
    "       breaking_load: 4.73 MN, seabed_friction: 0.85}\n"
    "lines:\n"
    "  - {name: bow-port, anchor: [286.4, 171.9], fairlead: [21.7, 8.35, -2.1],\n"
    "     sections: [{component: ch, length: 318.5 m}]}\n"
    "  - {name: bow-stbd, anchor: [291.2, -168.3], fairlead: [21.7, -8.35, -2.1],\n"
    "     sections: [{component: ch, length: 318.5 m}]}\n"
    "  - {name: stern-port, anchor: [-279.8, 174.6], fairlead: [-21.7, 8.35, -2.1],\n"
    "     sections: [{component: ch, length: 318.5 m}]}\n"
    "  - {name: stern-stbd, anchor: [-283.1, -170.2], fairlead: [-21.7, -8.35, -2.1],\n"
    "     sections: [{component: ch, length: 318.5 m}]}\n"
    "hull:\n  position: [1.25, -0.75]\n  heading: 3.5 deg\n";

/* Same geometry, for computing spans by hand below. */
static const double anchors[4][2] = {
    {286.4, 171.9}, {291.2, -168.3}, {-279.8, 174.6}, {-283.1, -170.2}};
static const double fairleads[4][2] = {{21.7, 8.35}, {21.7, -8.35}, {-21.7, 8.35}, {-21.7, -8.35}};
static const char *const names[4] = {"bow-port", "bow-stbd", "stern-port", "stern-stbd"};

static const char buoy_case[] = "title: Fictional buoyed line at Tarrow Reach\n"
                                "site: {depth: 42.5 m}\n"
                                "components:\n"
                                "  ch: {type: custom, wet_weight: 1.137 kN/m, axial_stiffness: 612 "
                                "MN, breaking_load: 4.73 MN}\n"
                                "lines:\n"
                                "  - name: lifted\n"
                                "    anchor: [150, 0]\n"
                                "    fairlead: [0, 0, -2]\n"
                                "    sections:\n"
                                "      - {component: ch, length: 200 m}\n"
                                "      - {buoy: 12 kN}\n"
                                "      - {component: ch, length: 3 m}\n"
                                "      - {component: ch, length: 117 m}\n";

/* Fictional: a 90 m chain to an anchor 461 m away in 48 m of water at the
 * invented Brannock Cove (issue 13); the elastic solve needs a strain far
 * past breaking.  MBL 4.73 MN invented. */
static const char stub_case[] = "title: Fictional short chain at Brannock Cove\n"
                                "site: {depth: 48 m}\n"
                                "components:\n"
                                "  ch: {type: custom, wet_weight: 0.4588 kN/m, axial_stiffness: "
                                "220 MN, breaking_load: 4.73 MN}\n"
                                "lines:\n"
                                "  - {name: stub, anchor: [-461, 0], fairlead: [0, 0, -6],\n"
                                "     sections: [{component: ch, length: 90 m}]}\n";

static int setup(void **state)
{
    (void)state;
    root = hf_test_root();
    if (hf_test_cli_setup(&bin, dir, sizeof dir, "cmd-spread") != 0)
        return -1;
    if (!bin)
        return 0;
    snprintf(small, sizeof small, "%s/small.yaml", dir);
    snprintf(buoyed, sizeof buoyed, "%s/buoy.yaml", dir);
    hf_test_root_path(oc3, sizeof oc3, "tests/data/oc3.yaml");
    hf_test_file_write(small, small_case);
    hf_test_file_write(buoyed, buoy_case);
    snprintf(stub, sizeof stub, "%s/stub.yaml", dir);
    hf_test_file_write(stub, stub_case);
    return 0;
}

static int teardown(void **state)
{
    (void)state;
    return bin && hf_test_tmpdir_remove(dir) != 0 ? -1 : 0;
}

/* ---- stiffness ---- */

/* OC3 spar mooring, Jonkman (2010), NREL/TP-500-47535: published stiffness
 * and vertical load (values recalled from memory, REFERENCE.md section 2
 * [mem]), within 0.5 %, through the whole CLI path (case file, units, CSV). */
static void test_stiffness_oc3_csv(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&quiet, "stiffness", oc3, "--csv", "-"), 0);
    char *cur = out, *line = hf_test_line_next(&cur);
    assert_non_null(line);
    assert_string_equal(line, "row,surge,sway,heave,roll,pitch,yaw");
    static const char *const rows[7] = {"surge", "sway", "heave",      "roll",
                                        "pitch", "yaw",  "static_load"};
    double K[7][6];
    for (int i = 0; i < 7; i++) {
        line = hf_test_line_next(&cur);
        assert_non_null(line);
        char *f[8] = {0};
        assert_int_equal(hf_test_csv_split(line, f, 8), 7);
        assert_string_equal(f[0], rows[i]);
        for (int j = 0; j < 6; j++)
            K[i][j] = strtod(f[j + 1], NULL);
    }
    assert_null(hf_test_line_next(&cur));
    /* kN/m, kN/rad, kN m/rad */
    assert_true(fabs(K[0][0] / 41.18 - 1.0) < 0.005);
    assert_true(fabs(K[1][1] / 41.18 - 1.0) < 0.005);
    assert_true(fabs(K[2][2] / 11.94 - 1.0) < 0.005);
    assert_true(fabs(K[0][4] / -2821.0 - 1.0) < 0.005);
    assert_true(fabs(K[1][3] / 2821.0 - 1.0) < 0.005);
    assert_true(fabs(K[3][3] / 311100.0 - 1.0) < 0.005);
    assert_true(fabs(K[4][4] / 311100.0 - 1.0) < 0.005);
    assert_true(fabs(K[5][5] / 11560.0 - 1.0) < 0.005);
    assert_true(fabs(K[6][2] / -1607.0 - 1.0) < 0.005); /* lines pull the hull down */
    assert_true(fabs(K[6][0]) < 1e-3 && fabs(K[6][1]) < 1e-3);

    /* The human table carries the caution; an offset moves the pose. */
    assert_int_equal(HF_TEST_RUN(&quiet, "stiffness", oc3, "--offset", "5,-2.5,3"), 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_non_null(strstr(out, "heading 3.000 deg"));
}

/* ---- curve ---- */

static void test_curve_against_lines(void **state)
{
    (void)state;
    NEED_BIN();
    const double dir_deg = 33.5, d = dir_deg * M_PI / 180.0;
    char dir_arg[32];
    snprintf(dir_arg, sizeof dir_arg, "%g", dir_deg);
    /* at -12 m and +12 m a chain passes its MBL: exit 1, the CSV complete */
    assert_int_equal(HF_TEST_RUN(&quiet, "curve", small, "--direction", dir_arg, "--range",
                                 "-12:12:4", "--csv", "-"),
                     1);
    static char curve[OUT_CAP];
    memcpy(curve, out, OUT_CAP);
    char *cur = curve, *line = hf_test_line_next(&cur);
    assert_non_null(line);
    assert_string_equal(line, "offset_m,restoring_kN,force_x_kN,force_y_kN,moment_z_kNm,"
                              "stiffness_kN_per_m,max_tension_kN,max_tension_line,max_utilisation,"
                              "T_bow-port_kN,T_bow-stbd_kN,T_stern-port_kN,T_stern-stbd_kN,alert");
    int rows = 0;
    double last = -INFINITY;
    while ((line = hf_test_line_next(&cur))) {
        char *f[16] = {0};
        assert_int_equal(hf_test_csv_split(line, f, 16), 14);
        /* alert: "overloaded" exactly when max_utilisation >= 1 */
        assert_string_equal(f[13], strtod(f[8], NULL) >= 1.0 ? "overloaded" : "");
        double s = strtod(f[0], NULL), restoring = strtod(f[1], NULL);
        double fx = strtod(f[2], NULL), fy = strtod(f[3], NULL);
        assert_true(fabs(s - (-12.0 + 4.0 * rows)) < 1e-9);
        assert_true(restoring > last); /* a stiffer pull back the further out */
        last = restoring;
        assert_true(fabs(restoring + fx * cos(d) + fy * sin(d)) < 1e-6 * (fabs(restoring) + 1));
        /* The same pose through 'lines': restoring = sum of the single lines'
         * horizontal pulls projected on the direction; fairlead tensions equal. */
        if (rows % 2 == 0) {
            char offset[80];
            snprintf(offset, sizeof offset, "%.17g,%.17g,0", s * cos(d), s * sin(d));
            /* 12 m out, the most loaded chain passes its MBL: exit 1 then */
            int lrc = HF_TEST_RUN(&quiet, "lines", small, "--offset", offset, "--csv", "-");
            assert_true(lrc == 0 || lrc == 1);
            char *lc = out, *ll = hf_test_line_next(&lc);
            double sum = 0.0;
            int over = 0;
            for (int i = 0; i < 4; i++) {
                ll = hf_test_line_next(&lc);
                assert_non_null(ll);
                char *g[20] = {0};
                assert_int_equal(hf_test_csv_split(ll, g, 20), 17);
                assert_string_equal(g[0], names[i]);
                /* alert: "overloaded" exactly when max_utilisation >= 1 */
                assert_string_equal(g[16], strtod(g[11], NULL) >= 1.0 ? "overloaded" : "");
                over |= g[16][0] != '\0';
                assert_true(!strcmp(g[1], "touchdown") || !strcmp(g[1], "suspended"));
                double h = strtod(g[3], NULL), t = strtod(g[2], NULL);
                /* fairlead in global axes: rest pose (1.25, -0.75, heading 3.5 deg) + offset */
                double a = 3.5 * M_PI / 180.0;
                double x = 1.25 + s * cos(d) + cos(a) * fairleads[i][0] - sin(a) * fairleads[i][1];
                double y = -0.75 + s * sin(d) + sin(a) * fairleads[i][0] + cos(a) * fairleads[i][1];
                double dx = x - anchors[i][0], dy = y - anchors[i][1], X = hypot(dx, dy);
                assert_true(fabs(strtod(g[10], NULL) - X) < 1e-6); /* span_m */
                sum += h * (dx * cos(d) + dy * sin(d)) / X;
                assert_true(fabs(strtod(f[9 + i], NULL) - t) <= 1e-8 * t);
            }
            assert_true(fabs(sum - restoring) <= 1e-7 * fabs(sum) + 1e-6);
            assert_int_equal(lrc, over);
        }
        rows++;
    }
    assert_int_equal(rows, 7);
}

/* stiffness_kN_per_m is analytic; check it against differencing the CLI's own
 * restoring column over +-5 mm (central difference, tolerance 0.1 %). */
static void test_curve_stiffness_column(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&quiet, "curve", small, "--direction=-71.25",
                                 "--range=6.995:7.005:0.005", "--csv=-"),
                     0);
    char *cur = out, *line = hf_test_line_next(&cur);
    double r[3], k[3];
    for (int i = 0; i < 3; i++) {
        line = hf_test_line_next(&cur);
        assert_non_null(line);
        char *f[16] = {0};
        hf_test_csv_split(line, f, 16);
        r[i] = strtod(f[1], NULL);
        k[i] = strtod(f[5], NULL);
    }
    double fd = (r[2] - r[0]) / 0.01;
    assert_true(k[1] > 0.0);
    assert_true(fabs(fd / k[1] - 1.0) < 1e-3);
}

static void test_curve_table_and_file(void **state)
{
    (void)state;
    NEED_BIN();
    char csv[400];
    snprintf(csv, sizeof csv, "%s/curve.csv", dir);
    assert_int_equal(HF_TEST_RUN(&quiet, "curve", small, "--direction", "90", "--range", "0:10:2.5",
                                 "--csv", csv),
                     0);
    assert_non_null(strstr(out, "restoring"));
    assert_non_null(strstr(out, "CAUTION"));
    struct stat sb;
    assert_int_equal(stat(csv, &sb), 0);
    char *text = hf_test_file_read(csv, NULL);
    assert_non_null(text);
    int newlines = 0; /* what wc -l counts */
    for (const char *c = text; *c; c++)
        newlines += *c == '\n';
    free(text);
    assert_int_equal(newlines, 6);
}

/* ---- lines ---- */

static void test_lines_csv_and_profiles(void **state)
{
    (void)state;
    NEED_BIN();
    char pdir[400];
    snprintf(pdir, sizeof pdir, "%s/prof/nested", dir); /* created with its parent */
    assert_int_equal(HF_TEST_RUN(&quiet, "lines", small, "--csv", "-", "--profiles", pdir), 0);
    char *cur = out, *line = hf_test_line_next(&cur);
    assert_non_null(line);
    const char *want = "line,status,fairlead_tension_kN,fairlead_horizontal_kN,"
                       "fairlead_vertical_kN,top_angle_deg,anchor_tension_kN,anchor_vertical_kN,"
                       "anchor_uplift_deg,grounded_m,span_m,max_utilisation";
    assert_int_equal(strncmp(line, want, strlen(want)), 0);
    double tension[4], hor[4], ver[4];
    for (int i = 0; i < 4; i++) {
        line = hf_test_line_next(&cur);
        assert_non_null(line);
        char *f[20] = {0};
        assert_true(hf_test_csv_split(line, f, 20) >= 12);
        tension[i] = strtod(f[2], NULL);
        hor[i] = strtod(f[3], NULL);
        ver[i] = strtod(f[4], NULL);
        /* T^2 = H^2 + V^2 at the fairlead; top angle atan(V/H) */
        assert_true(fabs(hypot(hor[i], ver[i]) - tension[i]) < 1e-7 * tension[i]);
        assert_true(fabs(strtod(f[5], NULL) - atan2(ver[i], hor[i]) * 180 / M_PI) < 1e-6);
        double u = strtod(f[11], NULL);
        assert_true(fabs(u - tension[i] / 4730.0) < 1e-7); /* T/MBL, MBL 4.73 MN */
    }
    assert_null(hf_test_line_next(&cur));
    /* Profiles: global coordinates from the anchor on the seabed (z = -42.5)
     * to the fairlead (z = -2.1 at the rest pose), ending at the fairlead tension. */
    for (int i = 0; i < 4; i++) {
        char p[600];
        snprintf(p, sizeof p, "%s/%s.csv", pdir, names[i]);
        FILE *fp = fopen(p, "r");
        assert_non_null(fp);
        char buf[512], lastbuf[512] = "";
        assert_non_null(fgets(buf, sizeof buf, fp));
        assert_string_equal(buf, "arc_m,x_m,y_m,z_m,tension_kN\n");
        assert_non_null(fgets(buf, sizeof buf, fp));
        char *f[8] = {0};
        assert_int_equal(hf_test_csv_split(buf, f, 8), 5);
        assert_true(fabs(strtod(f[0], NULL)) < 1e-9);
        assert_true(fabs(strtod(f[1], NULL) - anchors[i][0]) < 1e-6);
        assert_true(fabs(strtod(f[2], NULL) - anchors[i][1]) < 1e-6);
        assert_true(fabs(strtod(f[3], NULL) + 42.5) < 1e-6);
        int n = 1;
        while (fgets(buf, sizeof buf, fp)) {
            memcpy(lastbuf, buf, sizeof buf);
            n++;
        }
        fclose(fp);
        assert_true(n > 50);
        assert_int_equal(hf_test_csv_split(lastbuf, f, 8), 5);
        double a = 3.5 * M_PI / 180.0;
        double x = 1.25 + cos(a) * fairleads[i][0] - sin(a) * fairleads[i][1];
        double y = -0.75 + sin(a) * fairleads[i][0] + cos(a) * fairleads[i][1];
        assert_true(fabs(strtod(f[0], NULL) - 318.5) < 1e-6);
        assert_true(fabs(strtod(f[1], NULL) - x) < 1e-5);
        assert_true(fabs(strtod(f[2], NULL) - y) < 1e-5);
        assert_true(fabs(strtod(f[3], NULL) + 2.1) < 1e-5);
        assert_true(fabs(strtod(f[4], NULL) - tension[i]) < 1e-6 * tension[i]);
    }
    /* readable table with the caution */
    assert_int_equal(HF_TEST_RUN(&quiet, "lines", small, "--offset", "-3.5,2.25,-4"), 0);
    assert_non_null(strstr(out, "bow-stbd"));
    assert_non_null(strstr(out, "touchdown"));
    assert_non_null(strstr(out, "CAUTION"));
}

/* ---- usage, bad input, numerical failure ---- */

static void test_usage_errors(void **state)
{
    (void)state;
    NEED_BIN();
    static const struct {
        const char *args;
        int code;
        const char *says; /* expected in the combined output, or NULL */
    } t[] = {
        {"lines --help", 0, "usage: holdfast lines"},
        {"curve --help", 0, "usage: holdfast curve"},
        {"stiffness --help", 0, "usage: holdfast stiffness"},
        {"lines", 2, "missing the CASE"},
        {"stiffness", 2, "missing the CASE"},
        {"curve SMALL --range 0:5:1", 2, "--direction"},
        {"curve SMALL --direction 10", 2, "--range"},
        {"curve SMALL --direction ten --range 0:5:1", 2, "--direction: expected an angle"},
        {"curve SMALL --direction 0x10 --range 0:5:1", 2, "--direction"}, /* hex refused */
        {"curve SMALL --direction 30deg --range 0m:5m:1m --csv=", 2, "empty name"},
        {"curve SMALL --direction 1e309 --range 0:5:1", 2, "finite angle"},
        {"curve SMALL --direction nan --range 0:5:1", 2, "finite angle"},
        {"curve SMALL --direction 10 --range 0:5:-1", 2, "STEP"},
        {"curve SMALL --direction 10 --range 0:5", 2, "FROM:TO:STEP"},
        {"curve SMALL --direction 10 --range 0:1e9:1e-3", 2, "limit"},
        {"lines SMALL --offset 1,2", 2, "X,Y,HEADING_DEG"},
        {"lines SMALL --offset 1,2,inf", 2, "X,Y,HEADING_DEG"},
        {"stiffness SMALL --offset", 2, "--offset"},
        {"lines SMALL --csv", 2, "--csv"},
        {"lines SMALL --profiles", 2, "--profiles"},
        {"lines SMALL --frobnicate", 2, "unknown option"},
        {"stiffness SMALL SMALL", 2, "unexpected argument"},
        {"stiffness /nonexistent/case.yaml", 2, NULL},
    };
    for (size_t i = 0; i < sizeof t / sizeof t[0]; i++) {
        char words[128];
        const char *argv[16] = {bin};
        size_t n = 1;
        snprintf(words, sizeof words, "%s", t[i].args);
        for (char *w = strtok(words, " "); w && n < 15; w = strtok(NULL, " "))
            argv[n++] = strcmp(w, "SMALL") ? w : small; /* SMALL -> the case path */
        argv[n] = NULL;
        int rc = hf_test_run(argv, &both);
        if (rc != t[i].code || (t[i].says && !strstr(out, t[i].says)))
            fail_msg("holdfast %s: exit %d (want %d), output:\n%s", t[i].args, rc, t[i].code, out);
    }
}

/* Overload is a state (issue 13): the CSV is complete with alert
 * "overloaded" in its last column, the table carries the mark, stderr names
 * the line, and the exit status is 1 (a criterion failed). */
static void test_lines_overloaded(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&quiet, "lines", stub, "--csv", "-"), 1);
    assert_non_null(strstr(out, ",alert\n"));
    assert_non_null(strstr(out, ",overloaded\n"));
    assert_int_equal(HF_TEST_RUN(&both, "lines", stub), 1);
    assert_non_null(strstr(out, "holdfast lines: line stub is overloaded: utilisation "));
    assert_non_null(strstr(out, "kN >= MBL 4730.0 kN) at offset 0,0,0"));
    /* hypot(461, 42) / 90 - 1 = 4.1434 (Pythagoras) */
    assert_non_null(
        strstr(out, "holdfast lines: warning: line stub must stretch 414.34 % to reach"));
    assert_non_null(strstr(out, "CAUTION"));
    /* sweep: the short lengths are overloaded, 470 m is not; the CSV is
     * complete and the first overloaded case is named */
    assert_int_equal(HF_TEST_RUN(&both, "sweep", stub, "--vary",
                                 "lines[stub].sections[0].length=90:470:95", "--csv", "-"),
                     1);
    assert_non_null(strstr(out, ",alert\n"));
    assert_non_null(strstr(out, "\n90,ok,"));
    assert_non_null(strstr(out, "\n470,ok,"));
    assert_non_null(strstr(out, "holdfast sweep: line stub is overloaded: utilisation "));
    assert_non_null(strstr(out, "at case lines[stub].sections[0].length=90 m\n"));
    /* the small case's lines are far from breaking: no mark, exit 0 */
    assert_int_equal(HF_TEST_RUN(&both, "lines", small), 0);
    assert_null(strstr(out, "overloaded"));
    assert_null(strstr(out, "must stretch"));
}

/* A line the flat-seabed model cannot represent: exit 3, the line named, and
 * no CSV file left behind. */
static void test_numerical_failure(void **state)
{
    (void)state;
    NEED_BIN();
    char csv[400];
    snprintf(csv, sizeof csv, "%s/never.csv", dir);
    assert_int_equal(HF_TEST_RUN(&both, "lines", buoyed), 3);
    assert_non_null(strstr(out, "'lifted'"));
    assert_non_null(strstr(out, "failed"));
    assert_int_equal(HF_TEST_RUN(&both, "stiffness", buoyed, "--csv", csv), 3);
    assert_non_null(strstr(out, "'lifted'"));
    assert_int_equal(
        HF_TEST_RUN(&both, "curve", buoyed, "--direction", "0", "--range", "0:2:1", "--csv", csv),
        3);
    assert_non_null(strstr(out, "offset 0 m"));
    struct stat sb;
    assert_int_not_equal(stat(csv, &sb), 0);
}

/* Issue 12 item 10: a profile file that would be the case file itself
 * (a case saved as DIR/<line>.csv) is refused and the case kept. */
static void test_profile_is_the_case(void **state)
{
    (void)state;
    NEED_BIN();
    char pdir[400], casef[500];
    snprintf(pdir, sizeof pdir, "%s/clash", dir);
    assert_int_equal(mkdir(pdir, 0777), 0);
    snprintf(casef, sizeof casef, "%s/bow-port.csv", pdir);
    hf_test_file_write(casef, small_case);
    assert_int_equal(HF_TEST_RUN(&both, "lines", casef, "--profiles", pdir), 2);
    assert_non_null(strstr(out, "same file"));
    size_t n;
    char *kept = hf_test_file_read(casef, &n);
    assert_string_equal(kept, small_case);
    free(kept);
}

/* Issue 12 item 18: the man page names every option of every command's
 * --help and every column of the lines CSV (it omitted run --jobs/--quiet,
 * invert --csv, sweep --zip/--output and four lines columns). */
static void test_man_page_complete(void **state)
{
    (void)state;
    NEED_BIN();
    char path[600];
    hf_test_root_path(path, sizeof path, "docs/holdfast.1");
    size_t n;
    char *man = hf_test_file_read(path, &n);
    assert_non_null(man);
    static const char *const cmds[] = {"check", "lines", "curve",  "stiffness", "balance",
                                       "run",   "sweep", "invert", "plot"};
    for (size_t c = 0; c < sizeof cmds / sizeof cmds[0]; c++) {
        assert_int_equal(HF_TEST_RUN(&quiet, cmds[c], "--help"), 0);
        for (char *p = strstr(out, "--"); p; p = strstr(p + 2, "--")) {
            char opt[64] = "\\-\\-";
            size_t k = 4;
            for (const char *q = p + 2; (*q >= 'a' && *q <= 'z') && k + 1 < sizeof opt; q++)
                opt[k++] = *q;
            opt[k] = '\0';
            if (k > 4 && strcmp(opt + 4, "help") != 0 && !strstr(man, opt))
                fail_msg("docs/holdfast.1 does not mention --%s of '%s --help'", opt + 4, cmds[c]);
        }
    }
    assert_int_equal(HF_TEST_RUN(&quiet, "lines", small, "--csv", "-"), 0);
    out[strcspn(out, "\n")] = '\0';
    for (char *col = strtok(out, ","); col; col = strtok(NULL, ","))
        if (!strstr(man, col))
            fail_msg("docs/holdfast.1 does not name the lines CSV column %s", col);
    assert_non_null(strstr(man, "man ./docs/holdfast.1"));
    free(man);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_stiffness_oc3_csv),      cmocka_unit_test(test_curve_against_lines),
        cmocka_unit_test(test_curve_stiffness_column), cmocka_unit_test(test_curve_table_and_file),
        cmocka_unit_test(test_lines_csv_and_profiles), cmocka_unit_test(test_usage_errors),
        cmocka_unit_test(test_man_page_complete),      cmocka_unit_test(test_profile_is_the_case),
        cmocka_unit_test(test_numerical_failure),      cmocka_unit_test(test_lines_overloaded),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
