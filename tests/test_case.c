/* test_case.c - the YAML case loader: demo cases, malformed files with located errors, limits,
 * leaks. */
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
#include "holdfast/alloc.h"
#include "holdfast/case.h"

/* Lines 1-3 and 4-9 of a minimal valid case. */
#define HEAD                                                                                       \
    "site: {depth: 85 m}\n"                                                                        \
    "components:\n"                                                                                \
    "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
#define LINEA                                                                                      \
    "lines:\n"                                                                                     \
    "  - name: a\n"                                                                                \
    "    anchor: [-500, 0]\n"                                                                      \
    "    fairlead: [0, 0, -9]\n"                                                                   \
    "    sections:\n"                                                                              \
    "      - {component: chain76, length: 520 m}\n"
#define VALID HEAD LINEA

typedef struct {
    const char *what;
    const char *yaml; /* NULL: built by the test (long inputs) */
    hf_status status;
    int line, col;    /* expected FILE:LINE:COL */
    const char *frag; /* expected fragment of the message */
} bad_case;

static const bad_case bad[] = {
    {"site of the wrong type (a list)",
     "site: [85]\n"
     "components: {}\n" LINEA,
     HF_EINVAL, 1, 7, "site: expected the site (a mapping of keys to values), got a list"},
    {"negative depth",
     "site: {depth: -85 m}\n"
     "components:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 15, "site.depth: expected a positive length, got \"-85 m\""},
    {"NaN depth",
     "site: {depth: .nan}\n"
     "components:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 15, "site.depth: expected a"},
    {"1e309 depth",
     "site: {depth: 1e309}\n"
     "components:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 15, "got \"1e309\""},
    {"negative section length",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: -300 m}\n",
     HF_EINVAL, 9, 38, "lines[0].sections[0].length: expected a positive length, got \"-300 m\""},
    {"empty sections list",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections: []\n",
     HF_EINVAL, 8, 15, "lines[0].sections: expected at least one section"},
    {"unknown component",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain67, length: 520 m}\n",
     HF_EINVAL, 9, 21,
     "lines[0].sections[0].component: expected the name of a component (chain76), got "
     "\"chain67\"; did you mean \"chain76\"?"},
    {"duplicate line names",
     VALID "  - name: a\n    anchor: [500, 0]\n    fairlead: [0, 0, -9]\n"
           "    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 10, 11,
     "lines[1].name: expected a unique line name, got \"a\" again (first at 5:5)"},
    {"fairlead below the seabed",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -90]\n    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 7, 22, "lines[0].fairlead[2]: expected a fairlead above the seabed (z >= -85 m"},
    {"fairlead above the still water level (issue 12 item 2)",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, 2.5]\n    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 7, 22,
     "lines[0].fairlead[2]: expected a fairlead at or below the still water level (z <= 0 m"},
    {"a force where a length belongs",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: 300 kN}\n",
     HF_EINVAL, 9, 38, "lines[0].sections[0].length: expected a length, got \"300 kN\""},
    {"YAML syntax: unclosed flow list",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0\n"
          "    fairlead: [0, 0, -9]\n",
     HF_EINVAL, 7, 13, "YAML syntax: did not find expected ',' or ']'"},
    {"YAML syntax: tab indentation", HEAD "lines:\n  - name: a\n\tanchor: [-500, 0]\n", HF_EINVAL,
     6, 1, "YAML syntax: found a tab character that violates indentation"},
    {"unknown top-level key", HEAD "lins:\n  - name: a\n", HF_EINVAL, 4, 1,
     "expected a key of a case file (title, site, components, lines, hull, loads, criteria, "
     "studies, environments), got \"lins\"; did you mean \"lines\"?"},
    {"unknown line key",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sectoins:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 8, 5, "got \"sectoins\"; did you mean \"sections\"?"},
    {"missing fairlead",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 5, 5, "lines[0].fairlead: expected the fairlead's hull-frame [x, y, z] (required)"},
    {"missing site",
     "components:\n  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 1, "site: expected a site with its depth (required), got nothing"},
    {"duplicate mapping key",
     "site: {depth: 85 m, depth: 90 m}\n"
     "components:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 21, "site.depth: expected each key once, got \"depth\" again (first at 1:8)"},
    {"duplicate component name",
     HEAD "  chain76: {type: studlink_chain, grade: R3, diameter: 76 mm}\n" LINEA, HF_EINVAL, 4, 3,
     "components.chain76: expected each component name once"},
    {"anchor with three coordinates",
     HEAD "lines:\n  - name: a\n    anchor: [1, 2, 3]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 6, 13,
     "lines[0].anchor: expected the anchor's global [x, y] (a list of 2 numbers), got a list of 3"},
    {"clump at the anchor end",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {clump: 50 kN}\n"
          "      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 9, 9,
     "lines[0].sections[0]: expected a clump or buoy between two component "
     "sections, got one at the anchor end"},
    {"buoy at the fairlead end", VALID "      - {buoy: 20 kN}\n", HF_EINVAL, 10, 9,
     "lines[0].sections[1]: expected a clump or buoy between two component sections, got one at "
     "the fairlead end"},
    {"two point loads at the fairlead end", VALID "      - {clump: 20 kN}\n      - {buoy: 5 kN}\n",
     HF_EINVAL, 10, 9,
     "lines[0].sections[1]: expected a clump or buoy between two component "
     "sections, got one at the fairlead end"},
    {"component and clump in one entry",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n"
          "      - {component: chain76, length: 5 m, clump: 5 kN}\n",
     HF_EINVAL, 9, 9, "got more than one of component, clump and buoy"},
    {"misspelt component type",
     "site: {depth: 85 m}\ncomponents:\n"
     "  chain76: {type: studless-chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 3, 19, "components.chain76.type: expected a component type (studless_chain, "},
    {"grade on a wire rope",
     HEAD "  wire: {type: spiral_strand, grade: R3, diameter: 64 mm}\n" LINEA, HF_EINVAL, 4, 38,
     "components.wire.grade: expected no grade"},
    {"misspelt anchor kind", VALID "    anchor_kind: gravty\n", HF_EINVAL, 10, 18,
     "lines[0].anchor_kind: expected an anchor kind (drag, gravity, pile, plate), got \"gravty\"; "
     "did you mean \"gravity\"?"},
    {"gravity block without weight", VALID "    anchor_kind: gravity\n", HF_EINVAL, 5, 5,
     "lines[0].block_weight: expected a positive force (required), got nothing"},
    {"block weight on a drag anchor", VALID "    block_weight: 40 kN\n", HF_EINVAL, 10, 5,
     "lines[0].block_weight: expected block_weight only with anchor_kind: gravity"},
    {"force vector with a direction",
     VALID "loads:\n  - name: w\n    force: [100 kN, 0]\n"
           "    direction: 90 deg\n",
     HF_EINVAL, 13, 5, "loads[0].direction: expected no direction with a force given as [fx, fy]"},
    {"load without any force", VALID "loads:\n  - name: w\n", HF_EINVAL, 11, 5,
     "loads[0]: expected at least one of force, moment, wind and current, got none"},
    {"duplicate load names",
     VALID "loads:\n  - name: w\n    force: [1 kN, 0]\n"
           "  - name: w\n    force: [2 kN, 0]\n",
     HF_EINVAL, 13, 11,
     "loads[1].name: expected a unique load name, got \"w\" again (first at 11:5)"},
    {"misspelt criteria preset", VALID "criteria: {preset: api-rp2sk}\n", HF_EINVAL, 10, 20,
     "criteria.preset: expected a criteria preset (api-rp-2sk, "},
    {"safety factor below 1", VALID "criteria: {intact_factor: 0.8}\n", HF_EINVAL, 10, 27,
     "criteria.intact_factor: expected 0 (no check) or a safety factor >= 1, got \"0.8\""},
    /* issue 12 item 17: clear messages for near misses */
    {"abbreviated component type",
     "site: {depth: 85 m}\ncomponents:\n"
     "  chain76: {type: studless, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 3, 19,
     "components.chain76.type: expected a component type (studless_chain, studlink_chain, "
     "six_strand, spiral_strand, polyester, nylon, custom), got \"studless\"; did you mean "
     "\"studless_chain\"?"},
    {"decimal comma in a block value",
     "site:\n  depth: 85,5 m\ncomponents:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 2, 10,
     "site.depth: expected a length, got \"85,5 m\": a decimal comma? write \"85.5 m\""},
    {"decimal comma in a flow mapping",
     "site: {depth: 85,5 m}\ncomponents:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 18,
     "site: expected a key of the site, got \"5 m\": a decimal comma? in a {...} mapping a "
     "comma separates entries: write \"85.5 m\""},
    /* issue 12 item 6: names that would write DIR/.csv or shadow an index */
    {"empty line name",
     HEAD "lines:\n  - name: \"\"\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 5, 11,
     "lines[0].name: expected a line name of at least one letter, digit, '_' "
     "or '-', got an empty name"},
    {"numeric line name",
     HEAD "lines:\n  - name: 7\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 5, 11,
     "lines[0].name: expected a line name with at least one letter, '_' or '-' "
     "(a number would be read as an index in lines[INDEX]), got \"7\""},
    {"numeric load name", VALID "loads:\n  - name: 2\n    force: [1 kN, 0]\n", HF_EINVAL, 11, 11,
     "loads[0].name: expected a load name with at least one letter"},
    {"empty study name", VALID "studies:\n  - {name: '', kind: lines}\n", HF_EINVAL, 11, 12,
     "studies[0].name: expected a study name of at least one letter"},
    /* issue 12 item 3: one parameter varied twice, through an alias */
    {"parameter varied twice in a study",
     VALID "studies:\n  - name: s\n    kind: sweep\n"
           "    vary:\n      - {path: \"lines[0].sections[0].length\", values: [500 m]}\n"
           "      - {path: \"lines[a].sections[0].length\", values: [510 m]}\n",
     HF_EINVAL, 15, 16,
     "studies[0].vary[1].path: expected each parameter varied once, got "
     "\"lines[a].sections[0].length\", which sets the same value as "
     "\"lines[0].sections[0].length\" (vary[0])"},
    {"misspelt study kind", VALID "studies:\n  - {name: s, kind: sweeep}\n", HF_EINVAL, 11, 21,
     "studies[0].kind: expected a study kind (lines, curve, stiffness, balance, sweep, invert, "
     "design), got \"sweeep\"; did you mean \"sweep\"?"},
    {"unknown parameter path",
     VALID "studies:\n  - name: s\n    kind: sweep\n    vary:\n"
           "      - {path: site.dept, values: [80 m]}\n",
     HF_EINVAL, 14, 16,
     "studies[0].vary[0].path: parameter path \"site.dept\": unknown site parameter"},
    {"range with a zero step",
     VALID "studies:\n  - name: s\n    kind: sweep\n    vary:\n"
           "      - {path: site.depth, range: [80 m, 90 m, 0 m]}\n",
     HF_EINVAL, 14, 48,
     "studies[0].vary[0].range[2]: expected a non-zero step pointing from 80 m to 90 m, got \"0 "
     "m\""},
    {"zipped lists of unequal length",
     VALID "studies:\n  - name: s\n    kind: sweep\n    vary:\n"
           "      - {path: site.depth, values: [80 m, 90 m]}\n"
           "      - {path: site.water_level, values: [1 m]}\n    combine: zip\n",
     HF_EINVAL, 16, 14,
     "studies[0].combine: expected lists of equal length for zip, got 2 and 1 values"},
    {"unknown invert output",
     VALID "studies:\n  - name: inv\n    kind: invert\n"
           "    vary: {path: \"lines[a].sections[0].length\", range: [500 m, 540 m]}\n"
           "    target: {output: fairlead_tensoin, line: a, value: 100 kN}\n",
     HF_EINVAL, 14, 22, "fairlead_tensoin"},
    {"invert target on an unknown line",
     VALID "studies:\n  - name: inv\n    kind: invert\n"
           "    vary: {path: \"lines[a].sections[0].length\", range: [500 m, 540 m]}\n"
           "    target: {output: fairlead_tension, line: b, value: 100 kN}\n",
     HF_EINVAL, 14, 46, "studies[0].target.line: expected the name of a line, got \"b\""},
    {"balance study naming an unknown load",
     VALID "loads:\n"
           "  - {name: storm, force: 100 kN, direction: 0 deg}\nstudies:\n"
           "  - {name: b, kind: balance, loads: [strom]}\n",
     HF_EINVAL, 13, 38,
     "studies[0].loads[0]: expected the name of a load case, got \"strom\"; did you mean "
     "\"storm\"?"},
    {"duplicate study names",
     VALID "studies:\n  - {name: r, kind: lines}\n"
           "  - {name: r, kind: stiffness}\n",
     HF_EINVAL, 12, 12, "studies[1].name: expected a unique study name, got \"r\" again"},
    {"alias of the wrong type",
     "site: &s {depth: 85 m}\ncomponents:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA "title: *s\n",
     HF_EINVAL, 1, 7, "title: expected a title (text), got a mapping"},
    {"alias to an undefined anchor", VALID "title: *nowhere\n", HF_EINVAL, 10, 8,
     "expected an alias to an anchor defined above (&nowhere), got *nowhere"},
    {"alias inside the value it names", VALID "hull: {outline: &o [[0, 0], [1, 0], *o]}\n",
     HF_EINVAL, 10, 37, "expected an alias to a finished value, got *o inside the value it names"},
    {"a second YAML document", VALID "---\nsite: {depth: 5 m}\n", HF_EINVAL, 10, 1,
     "expected one YAML document in a case file, got a second one"},
    {"empty file", "", HF_EINVAL, 1, 1, "got an empty file"},
    {"a list as a key in a later section entry",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {clump: 5 kN}\n      - {[x]: 1}\n",
     HF_EINVAL, 9, 9, "got one at the anchor end"},
    {"a mapping as a key in a study", VALID "studies:\n  - {{a: 1}: 2, kind: lines}\n", HF_EINVAL,
     11, 6, "studies[0]: expected a key name in a lines study, got a mapping"},
    {"a case that is a list", "- site\n- lines\n", HF_EINVAL, 1, 1,
     "expected a case file (a mapping of keys to values), got a list"},
    {"comment-only file", "# nothing here\n", HF_EINVAL, 1, 1, "got an empty file"},
    {"water level below the seabed",
     "site: {depth: 85 m, water_level: -90 m}\ncomponents:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 34, "site.water_level: expected a water level above the seabed"},
    {"a length where a mass per metre belongs",
     "site: {depth: 85 m}\ncomponents:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm, mass: 3 m}\n" LINEA,
     HF_EINVAL, 3, 69, "components.chain76.mass: expected a mass per length, got \"3 m\""},
    {"hull outline of two points", VALID "hull: {outline: [[0, 0], [1, 1]]}\n", HF_EINVAL, 10, 17,
     "hull.outline: expected a polygon of at least 3 hull-frame points"},
    {"sweep value of the wrong kind",
     VALID "studies:\n  - name: s\n    kind: sweep\n    vary:\n"
           "      - {path: site.water_level, values: [1 kN]}\n",
     HF_EINVAL, 14, 43, "studies[0].vary[0].values[0]: expected a length, got \"1 kN\""},
    {"line name with a space",
     HEAD "lines:\n  - name: bow port\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: 520 m}\n",
     HF_EINVAL, 5, 11, "lines[0].name: expected a line name made of letters, digits, '_' and '-'"},
    {"lines as a mapping", HEAD "lines: {}\n", HF_EINVAL, 4, 8,
     "lines: expected a list of lines, got a mapping"},
    {"custom component without a breaking load",
     HEAD "  heavy: {type: custom, wet_weight: 1.1 kN/m, axial_stiffness: 500 MN}\n" LINEA,
     HF_EINVAL, 4, 10, "components.heavy: "},
    {"uplift limit of 95 degrees", VALID "    max_uplift: 95 deg\n", HF_EINVAL, 10, 17,
     "lines[0].max_uplift: expected an angle from 0 to below 90 deg, got \"95 deg\""},
    {"empty value",
     "site: {depth: }\ncomponents:\n"
     "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n" LINEA,
     HF_EINVAL, 1, 15, "site.depth: expected a length, got nothing"},
    {"negative friction on a clump",
     HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n    sections:\n      - {component: chain76, length: 200 m}\n"
          "      - {clump: 20 kN, friction: -0.3}\n      - {component: chain76, length: 320 m}\n",
     HF_EINVAL, 10, 34,
     "lines[0].sections[1].friction: expected a plain number >= 0, got \"-0.3\""},
    {"curve range that never reaches its end",
     VALID "studies:\n  - name: c\n    kind: curve\n"
           "    direction: 0 deg\n    range: [0 m, 10 m, -1 m]\n",
     HF_EINVAL, 14, 24, "studies[0].range[2]: expected a non-zero step pointing from 0 m to 10 m"},
};
#define NBAD (sizeof bad / sizeof bad[0])

/* Loads text; checks status, location and fragment; the model must be empty after.
 * Returns 1 when all holds, else prints why and returns 0. */
static int check_bad(const char *what, const char *text, size_t len, hf_status status, int line,
                     int col, const char *frag)
{
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    hf_error_clear(&err);
    hf_status st = hf_case_load_buffer(text, len, "t.yaml", &m, &err);
    char where[64];
    snprintf(where, sizeof where, "t.yaml:%d:%d: ", line, col);
    int ok = 1;
    if (st != status || err.status != status || strncmp(err.text, where, strlen(where)) ||
        !strstr(err.text, frag)) {
        print_error("%s: got status %d, message\n  %s\nexpected status %d at %s with\n  %s\n", what,
                    (int)st, err.text, (int)status, where, frag);
        ok = 0;
    }
    if (m.nlines || m.lines || m.components || m.source_path || m.title) {
        print_error("%s: the model is not empty after the failure\n", what);
        ok = 0;
    }
    hf_model_free(&m);
    return ok;
}

static void expect_bad(const char *what, const char *text, size_t len, hf_status status, int line,
                       int col, const char *frag)
{
    if (!check_bad(what, text, len, status, line, col, frag))
        fail();
}

static void malformed_table(void **state)
{
    (void)state;
    assert_true(NBAD >= 30);
    size_t failed = 0;
    for (size_t i = 0; i < NBAD; i++)
        failed += !check_bad(bad[i].what, bad[i].yaml, strlen(bad[i].yaml), bad[i].status,
                             bad[i].line, bad[i].col, bad[i].frag);
    if (failed)
        fail_msg("%zu of %zu malformed cases gave another status, place or message", failed,
                 (size_t)NBAD);
}

/* The minimal case itself is valid, so every failure above comes from its edit. */
static void minimal_case_is_valid(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    assert_int_equal(hf_case_load_buffer(VALID, strlen(VALID), "t.yaml", &m, &err), HF_OK);
    assert_int_equal(m.nlines, 1);
    assert_int_equal(m.lines[0].line.n, 1);
    HF_TEST_ASSERT_NEAR(m.lines[0].pieces[0].length, 520.0, 1e-12);
    /* R3 chain MBL = 0.0223 d^2 (44 - 0.08 d) kN: DNV-OS-E302 / IACS UR W22 (via
     * REFERENCE.md section 3), 76 mm gives 4884 kN. */
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[0].mbl, 0.0223 * 76 * 76 * (44 - 0.08 * 76) * 1e3,
                        1e-6);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[0].mbl, 4884e3, 1e3);
    assert_string_equal(m.source_path, "t.yaml");
    assert_null(m.criteria.preset);
    assert_int_equal(m.nloads, 0);
    hf_model_free(&m);
    /* no studies: section gives an empty study list */
    hf_study_list sl;
    hf_study_list_init(&sl);
    assert_int_equal(
        hf_case_load_buffer_with_studies(VALID, strlen(VALID), "t.yaml", &m, &sl, &err), HF_OK);
    assert_int_equal(sl.n, 0);
    assert_null(sl.v);
    hf_study_list_free(&sl);
    hf_model_free(&m);
}

static void limits_named(void **state)
{
    (void)state;
    char *buf = malloc(64 * 1024);
    assert_non_null(buf);
    size_t n;

    /* nesting deeper than HF_CASE_MAX_DEPTH: root map + 31 lists is the limit */
    n = (size_t)sprintf(buf, VALID "x: ");
    for (int i = 0; i < 40; i++)
        buf[n++] = '[';
    for (int i = 0; i < 40; i++)
        buf[n++] = ']';
    buf[n++] = '\n';
    buf[n] = '\0';
    expect_bad("deep nesting", buf, n, HF_ELIMIT, 10, 4 + HF_CASE_MAX_DEPTH - 1,
               "expected at most 32 nested levels (HF_CASE_MAX_DEPTH)");

    /* a scalar longer than HF_CASE_MAX_SCALAR */
    n = (size_t)sprintf(buf, VALID "title: ");
    memset(buf + n, 'x', HF_CASE_MAX_SCALAR + 1);
    n += HF_CASE_MAX_SCALAR + 1;
    buf[n++] = '\n';
    buf[n] = '\0';
    expect_bad("long scalar", buf, n, HF_ELIMIT, 10, 8,
               "expected a value of at most 4096 bytes (HF_CASE_MAX_SCALAR), got 4097 bytes");

    /* exactly HF_CASE_MAX_SCALAR is fine */
    n = (size_t)sprintf(buf, VALID "title: ");
    memset(buf + n, 'y', HF_CASE_MAX_SCALAR);
    n += HF_CASE_MAX_SCALAR;
    buf[n] = '\0';
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    assert_int_equal(hf_case_load_buffer(buf, n, "t.yaml", &m, &err), HF_OK);
    assert_int_equal(strlen(m.title), HF_CASE_MAX_SCALAR);
    hf_model_free(&m);

    /* more than HF_LINE_MAX_SECTIONS component sections */
    n = (size_t)sprintf(buf, HEAD "lines:\n  - name: a\n    anchor: [-500, 0]\n"
                                  "    fairlead: [0, 0, -9]\n    sections:\n");
    for (int i = 0; i <= HF_LINE_MAX_SECTIONS; i++)
        n += (size_t)sprintf(buf + n, "      - {component: chain76, length: 17 m}\n");
    expect_bad("too many sections", buf, n, HF_ELIMIT, 9 + HF_LINE_MAX_SECTIONS, 9,
               "expected at most 32 component sections per line (HF_LINE_MAX_SECTIONS)");

    /* a name longer than HF_MODEL_MAX_NAME */
    n = (size_t)sprintf(buf, HEAD "lines:\n  - name: ");
    memset(buf + n, 'k', HF_MODEL_MAX_NAME + 1);
    n += HF_MODEL_MAX_NAME + 1;
    n += (size_t)sprintf(buf + n, "\n    anchor: [-500, 0]\n    fairlead: [0, 0, -9]\n"
                                  "    sections:\n      - {component: chain76, length: 520 m}\n");
    expect_bad("long name", buf, n, HF_ELIMIT, 5, 11, "(HF_MODEL_MAX_NAME)");

    /* NUL byte inside a value */
    static const char nul[] = "title: \"a\\0b\"\n" VALID;
    expect_bad("NUL in a value", nul, sizeof nul - 1, HF_EINVAL, 1, 8, "NUL byte");
    free(buf);

    /* the file size limit, through hf_case_load on a sparse file */
    char path[] = "/tmp/hf_test_case_XXXXXX";
    int fd = mkstemp(path);
    assert_true(fd >= 0);
    assert_int_equal(ftruncate(fd, (off_t)HF_CASE_MAX_BYTES + 1), 0);
    close(fd);
    hf_model_init(&m);
    assert_int_equal(hf_case_load(path, &m, &err), HF_ELIMIT);
    assert_non_null(strstr(err.text, "(HF_CASE_MAX_BYTES)"));
    assert_int_equal(m.nlines, 0);
    unlink(path);
}

static void aliases_expand(void **state)
{
    (void)state;
    static const char yaml[] = "site: {depth: 85 m}\n"
                               "components:\n"
                               "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
                               "lines:\n"
                               "  - name: a\n"
                               "    anchor: [-500, 0]\n"
                               "    fairlead: [0, 0, -9]\n"
                               "    sections: &cc\n"
                               "      - {component: chain76, length: &len 260 m}\n"
                               "      - {clump: 35 kN}\n"
                               "      - {component: chain76, length: *len}\n"
                               "  - name: b\n"
                               "    anchor: [500, 0]\n"
                               "    fairlead: [0, 0, -9]\n"
                               "    sections: *cc\n";
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (hf_case_load_buffer(yaml, strlen(yaml), "t.yaml", &m, &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_int_equal(m.lines[1].npieces, 3);
    HF_TEST_ASSERT_NEAR(m.lines[1].pieces[2].length, 260.0, 0);
    HF_TEST_ASSERT_NEAR(m.lines[1].line.joint[0].load, 35e3, 1e-9);
    hf_model_free(&m);

    /* exponential expansion ("billion laughs") stops at a named limit */
    char buf[2048];
    size_t n = (size_t)sprintf(buf, VALID "x0: &a0 [0, 0, 0, 0, 0, 0, 0, 0, 0, 0]\n");
    for (int k = 1; k <= 6; k++)
        n += (size_t)sprintf(buf + n,
                             "x%d: &a%d [*a%d, *a%d, *a%d, *a%d, *a%d, *a%d, *a%d, *a%d, "
                             "*a%d, *a%d]\n",
                             k, k, k - 1, k - 1, k - 1, k - 1, k - 1, k - 1, k - 1, k - 1, k - 1,
                             k - 1);
    hf_status st = hf_case_load_buffer(buf, n, "t.yaml", &m, &err);
    assert_int_equal(st, HF_ELIMIT);
    assert_non_null(strstr(err.text, "expected aliases to expand to at most 500000 values"));
    assert_int_equal(m.nlines, 0);
}

static void unreadable_file(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    assert_int_equal(hf_case_load("/nonexistent/holdfast/x.yaml", &m, &err), HF_EIO);
    assert_non_null(strstr(err.text, "/nonexistent/holdfast/x.yaml: cannot open the case file"));
    assert_int_equal(hf_case_load(NULL, &m, &err), HF_EINVAL);
    /* a directory opens but cannot be read */
    assert_int_equal(hf_case_load("/tmp", &m, &err), HF_EIO);
    assert_int_equal(m.nlines, 0);
}

/* A case using every section of the format, with units to convert. */
static const char full_case[] =
    "title: Test spread at the invented Merrow Bank\n"
    "site: {depth: 0.05 km, water_level: 120 cm, water_density: 1.02 t/m^3}\n"
    "components:\n"
    "  c: {type: studless_chain, grade: R4, diameter: 3 in}\n"
    "  w: {type: six_strand, diameter: 52 mm, breaking_load: 1850 kN, seabed_friction: 0.35}\n"
    "  k: {type: custom, wet_weight: 0.75 kN/m, axial_stiffness: 210 MN, breaking_load: 2.6 MN,"
    " seabed_friction: 1.1}\n"
    "hull: {position: [12.5, -3.25], heading: 0.5 rad, outline: [[10, 5], [-10, 5], [-10, -5]]}\n"
    "lines:\n"
    "  - name: n1\n"
    "    anchor: [412.5, -3.25]\n"
    "    fairlead: [8.5, 0, -3]\n"
    "    anchor_kind: gravity\n"
    "    block_weight: 12 tf\n"
    "    block_friction: 0.45\n"
    "    sections:\n"
    "      - {component: c, length: 150 m}\n"
    "      - {clump: 50 kN}\n"
    "      - {clump: 30 kN, friction: 0.5}\n"
    "      - {component: w, length: 300 m}\n"
    "      - {buoy: 15 kN, friction: 0.2}\n"
    "      - {component: k, length: 25 m}\n"
    "  - name: n2\n"
    "    anchor: [-380, 40]\n"
    "    fairlead: [-8.5, 0, -3]\n"
    "    max_uplift: 5 deg\n"
    "    sections: [{component: c, length: 420 m}]\n"
    "  - name: n3\n"
    "    anchor: [-380, -40]\n"
    "    fairlead: [-8.5, 0, -3]\n"
    "    anchor_kind: pile\n"
    "    sections: [{component: c, length: 420 m}]\n"
    "loads:\n"
    "  - name: push\n"
    "    force: [30 kN, -40 kN]\n"
    "    moment: 250 kN*m\n"
    "  - name: gust\n"
    "    force: 2 MN\n"
    "    direction: 90 deg\n"
    "    wind: {speed: 30 m/s, direction: 180 deg, coefficient: 1.2, area: 400 m^2}\n"
    "    current: {speed: 2 kn, direction: 0.25 rad, coefficient: 0.9, area: 80 m^2}\n"
    "  - name: drift\n"
    "    current: {speed: 1 m/s, direction: 45 deg, coefficient: 1, area: 10 m^2, density: 1000 "
    "kg/m^3}\n"
    "criteria: {preset: api-rp-2sk, analysis: dynamic, damaged_factor: 1.5, max_offset: 25 ft}\n"
    "studies:\n"
    "  - {name: at-rest, kind: lines, offset: [1 m, -2 m, 3 deg]}\n"
    "  - {name: k6, kind: stiffness}\n"
    "  - {name: c1, kind: curve, direction: 30 deg, range: [-5 m, 5 m, 500 mm]}\n"
    "  - {name: b1, kind: balance, loads: [gust, push]}\n"
    "  - name: s1\n"
    "    kind: sweep\n"
    "    vary:\n"
    "      - {path: \"lines[n1].sections[1].clump\", values: [10 kN, 20 kN, 35 kN]}\n"
    "      - {path: \"lines[0].sections[4].buoy\", values: [1 kN, 2 kN, 3 kN]}\n"
    "      - {path: hull.heading, range: [0, 710, 2.5]}\n"
    "    combine: grid\n"
    "    outputs: [fairlead_tension, \"utilisation:n2\", max_utilisation]\n"
    "  - name: s2\n"
    "    kind: sweep\n"
    "    vary: [{path: site.water_level, values: [0 m, 1 m]},"
    " {path: components.w.diameter, values: [48 mm, 52 mm]}]\n"
    "    combine: zip\n"
    "  - name: inv\n"
    "    kind: invert\n"
    "    vary: {path: \"lines[n2].anchor_radius\", range: [350 m, 0.45 km]}\n"
    "    target: {output: fairlead_horizontal, line: n2, value: 150 kN}\n"
    "  - name: inv2\n"
    "    kind: invert\n"
    "    vary: {path: \"lines[n1].sections[1].clump\", range: [1 kN, 100 kN]}\n"
    "    target: {output: stiffness_surge, value: 25 kN/m}\n";

static void full_case_loads(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    hf_study_list sl;
    hf_study_list_init(&sl);
    hf_status st =
        hf_case_load_buffer_with_studies(full_case, strlen(full_case), "full.yaml", &m, &sl, &err);
    if (st != HF_OK)
        fail_msg("%s", err.text);
    const double deg = M_PI / 180.0;
    assert_string_equal(m.title, "Test spread at the invented Merrow Bank");
    HF_TEST_ASSERT_NEAR(m.site.depth, 50.0, 1e-12);
    HF_TEST_ASSERT_NEAR(m.site.water_level, 1.2, 1e-12);
    HF_TEST_ASSERT_NEAR(m.site.water_density, 1020.0, 1e-9);
    assert_int_equal(m.ncomponents, 3);
    const hf_component *c = &m.components[0].comp;
    assert_int_equal(c->type, HF_COMP_STUDLESS_CHAIN);
    assert_int_equal(c->grade, HF_GRADE_R4);
    HF_TEST_ASSERT_NEAR(c->diameter, 0.0762, 1e-12); /* 3 in = 76.2 mm (exact inch) */
    assert_int_equal(m.components[0].src_line, 4);
    assert_int_equal(m.components[0].src_col, 3);
    const hf_component *w = &m.components[1].comp;
    assert_true(w->given & (1u << HF_PROP_MBL));
    HF_TEST_ASSERT_NEAR(w->value[HF_PROP_MBL], 1.85e6, 1e-6);
    HF_TEST_ASSERT_NEAR(w->value[HF_PROP_FRICTION], 0.35, 1e-12);
    assert_true(w->approximate); /* EA and mass still from the rough wire formulas */
    const hf_component *k = &m.components[2].comp;
    HF_TEST_ASSERT_NEAR(k->value[HF_PROP_WET_WEIGHT], 750.0, 1e-9);
    HF_TEST_ASSERT_NEAR(k->value[HF_PROP_EA], 210e6, 1e-3);

    HF_TEST_ASSERT_NEAR(m.hull.position[0], 12.5, 1e-12);
    HF_TEST_ASSERT_NEAR(m.hull.position[1], -3.25, 1e-12);
    HF_TEST_ASSERT_NEAR(m.hull.heading, 0.5, 1e-12);
    assert_int_equal(m.hull.noutline, 3);
    HF_TEST_ASSERT_NEAR(m.hull.outline[2][1], -5.0, 1e-12);

    assert_int_equal(m.nlines, 3);
    const hf_model_line *l = &m.lines[0];
    assert_string_equal(l->name, "n1");
    assert_int_equal(l->src_line, 9);
    assert_int_equal(l->src_col, 5);
    assert_int_equal(l->anchor_spec.kind, HF_ANCHOR_GRAVITY);
    /* 12 tf = 12000 kgf = 12000 * 9.80665 N (standard gravity, NIST SP 811) */
    HF_TEST_ASSERT_NEAR(l->anchor_spec.weight, 12000.0 * 9.80665, 1e-6);
    HF_TEST_ASSERT_NEAR(l->anchor_spec.friction, 0.45, 1e-12);
    assert_int_equal(l->npieces, 6);
    assert_int_equal(l->pieces[2].kind, HF_PIECE_CLUMP);
    HF_TEST_ASSERT_NEAR(l->pieces[2].friction, 0.5, 1e-12);
    HF_TEST_ASSERT_NEAR(l->pieces[1].friction, 1.0, 1e-12);
    assert_int_equal(l->pieces[4].kind, HF_PIECE_BUOY);
    /* resolved hf_line: 3 sections, the two clumps add, the buoy lifts */
    assert_int_equal(l->line.n, 3);
    HF_TEST_ASSERT_NEAR(l->line.joint[0].load, 80e3, 1e-9);
    HF_TEST_ASSERT_NEAR(l->line.joint[0].friction, (50.0 * 1.0 + 30.0 * 0.5) / 80.0, 1e-12);
    HF_TEST_ASSERT_NEAR(l->line.joint[1].load, -15e3, 1e-9);
    /* a buoy-only joint never rests on the seabed: its friction is not used */
    HF_TEST_ASSERT_NEAR(l->line.joint[1].friction, 0.0, 0);
    HF_TEST_ASSERT_NEAR(l->line.sec[1].mbl, 1.85e6, 1e-6);
    HF_TEST_ASSERT_NEAR(l->line.sec[2].weight, 750.0, 1e-9);
    HF_TEST_ASSERT_NEAR(l->line.sec[2].friction, 1.1, 1e-12);
    assert_int_equal(m.lines[1].anchor_spec.kind, HF_ANCHOR_DRAG);
    HF_TEST_ASSERT_NEAR(m.lines[1].anchor_spec.max_uplift_angle, 5 * deg, 1e-12);
    assert_int_equal(m.lines[2].anchor_spec.kind, HF_ANCHOR_PILE);

    assert_int_equal(m.nloads, 3);
    /* [30, -40] kN: magnitude 50 kN (3-4-5 triangle), direction atan2(-4, 3) */
    HF_TEST_ASSERT_NEAR(m.loads[0].force, 50e3, 1e-6);
    HF_TEST_ASSERT_NEAR(m.loads[0].direction, atan2(-4.0, 3.0), 1e-12);
    HF_TEST_ASSERT_NEAR(m.loads[0].moment, 250e3, 1e-6);
    assert_int_equal(m.loads[0].ndrag, 0);
    HF_TEST_ASSERT_NEAR(m.loads[1].force, 2e6, 1e-6);
    HF_TEST_ASSERT_NEAR(m.loads[1].direction, 90 * deg, 1e-12);
    assert_int_equal(m.loads[1].ndrag, 2);
    HF_TEST_ASSERT_NEAR(m.loads[1].drag[0].density, 1.225, 1e-12);
    HF_TEST_ASSERT_NEAR(m.loads[1].drag[0].speed, 30.0, 1e-12);
    HF_TEST_ASSERT_NEAR(m.loads[1].drag[0].direction, M_PI, 1e-12);
    HF_TEST_ASSERT_NEAR(m.loads[1].drag[1].density, 1020.0, 1e-9); /* the site's water */
    HF_TEST_ASSERT_NEAR(m.loads[1].drag[1].speed, 2 * 1852.0 / 3600.0, 1e-12); /* knots */
    HF_TEST_ASSERT_NEAR(m.loads[2].drag[0].density, 1000.0, 1e-9);

    assert_string_equal(m.criteria.preset, "api-rp-2sk");
    assert_int_equal(m.criteria.analysis, HF_ANALYSIS_DYNAMIC);
    /* API RP 2SK dynamic intact factor 1.67 (from memory, see REFERENCE.md section 4),
     * from the preset; the damaged factor is the user's override. */
    HF_TEST_ASSERT_NEAR(m.criteria.factor_intact, 1.67, 1e-12);
    HF_TEST_ASSERT_NEAR(m.criteria.factor_damaged, 1.5, 1e-12);
    HF_TEST_ASSERT_NEAR(m.criteria.max_offset, 25 * 0.3048, 1e-12);
    assert_non_null(m.criteria.source);

    assert_int_equal(sl.n, 8);
    const hf_study *s = sl.v;
    assert_int_equal(s[0].kind, HF_STUDY_LINES);
    HF_TEST_ASSERT_NEAR(s[0].offset[1], -2.0, 1e-12);
    HF_TEST_ASSERT_NEAR(s[0].offset[2], 3 * deg, 1e-12);
    assert_int_equal(s[1].kind, HF_STUDY_STIFFNESS);
    assert_int_equal(s[2].kind, HF_STUDY_CURVE);
    HF_TEST_ASSERT_NEAR(s[2].direction, 30 * deg, 1e-12);
    HF_TEST_ASSERT_NEAR(s[2].step, 0.5, 1e-12);
    assert_int_equal(s[3].nloads, 2);
    assert_string_equal(s[3].loads[1], "push");
    assert_int_equal(s[4].nvary, 3);
    assert_int_equal(s[4].vary[0].dim, HF_DIM_FORCE);
    assert_int_equal(s[4].vary[0].nvalues, 3);
    HF_TEST_ASSERT_NEAR(s[4].vary[0].values[2], 35e3, 1e-9);
    assert_int_equal(s[4].vary[2].dim, HF_DIM_ANGLE);
    HF_TEST_ASSERT_NEAR(s[4].vary[2].step, 2.5 * deg, 1e-12); /* plain angles are degrees */
    /* a range of angles keeps its whole turns: 0 to 710 deg, 285 values */
    HF_TEST_ASSERT_NEAR(s[4].vary[2].to, 710 * deg, 1e-12);
    assert_int_equal(hf_study_vary_count(&s[4].vary[2]), 285);
    assert_int_equal(s[4].zip, 0);
    assert_int_equal(s[4].noutputs, 3);
    assert_string_equal(s[4].outputs[1], "utilisation:n2");
    assert_int_equal(s[5].zip, 1);
    HF_TEST_ASSERT_NEAR(s[5].vary[1].values[0], 0.048, 1e-12);
    assert_int_equal(s[6].kind, HF_STUDY_INVERT);
    HF_TEST_ASSERT_NEAR(s[6].vary[0].to, 450.0, 1e-9);
    assert_string_equal(s[6].target_output, "fairlead_horizontal");
    assert_string_equal(s[6].target_line, "n2");
    HF_TEST_ASSERT_NEAR(s[6].target_value, 150e3, 1e-9);
    assert_null(s[7].target_line);
    HF_TEST_ASSERT_NEAR(s[7].target_value, 25e3, 1e-9); /* kN/m -> N/m */
    hf_study_list_free(&sl);
    hf_study_list_free(&sl); /* twice is fine: free re-initialises */
    hf_study_list_free(NULL);
    hf_model_free(&m);
    hf_model_free(&m); /* twice is fine: free re-initialises */
}

/* Every allocation failure gives HF_ENOMEM and an empty model (valgrind checks the leaks). */
static void allocation_failures(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    long n;
    for (n = 1; n < 100000; n++) {
        hf_alloc_fail_at(n, 0);
        hf_status st = hf_case_load_buffer(full_case, strlen(full_case), "full.yaml", &m, &err);
        hf_alloc_fail_at(0, 0);
        if (st == HF_OK)
            break;
        if (st != HF_ENOMEM)
            fail_msg("allocation %ld failing gave status %d: %s", n, (int)st, err.text);
        assert_int_equal(m.nlines, 0);
        assert_null(m.title);
    }
    assert_true(n > 100); /* the full case makes many allocations; all were tried */
    assert_int_equal(m.nlines, 3);
    hf_model_free(&m);
    /* sticky failure from the 40th allocation on */
    hf_alloc_fail_at(40, 1);
    assert_int_equal(hf_case_load_buffer(full_case, strlen(full_case), "full.yaml", &m, &err),
                     HF_ENOMEM);
    hf_alloc_fail_at(0, 0);
    assert_int_equal(m.nlines, 0);
}

static void demo_cases_load(void **state)
{
    (void)state;
    char path[4096];
    hf_model m;
    hf_error err;
    hf_model_init(&m);

    hf_study_list sl;
    hf_study_list_init(&sl);
    hf_test_root_path(path, sizeof path, "cases/barge.yaml");
    if (hf_case_load_with_studies(path, &m, &sl, &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_int_equal(m.nlines, 8);
    assert_int_equal(m.nloads, 3);
    assert_int_equal(sl.n, 7);
    assert_string_equal(m.criteria.preset, "api-rp-2sk");
    assert_true(m.hull.noutline >= 3);
    int kinds = 0;
    for (size_t i = 0; i < sl.n; i++)
        kinds |= 1 << sl.v[i].kind;
    assert_int_equal(kinds, 0x7f); /* every study kind appears (design: issue 14) */
    for (size_t i = 0; i < m.nlines; i++) {
        assert_int_equal(m.lines[i].line.n, 3);         /* chain - wire - chain */
        assert_true(m.lines[i].line.joint[0].load > 0); /* with a clump */
        assert_int_equal(m.components[m.lines[i].pieces[2].component].comp.type,
                         HF_COMP_SPIRAL_STRAND);
    }
    assert_true(m.site.depth >= 85.0 && m.site.depth <= 120.0);
    hf_model_free(&m);

    hf_test_root_path(path, sizeof path, "cases/marina.yaml");
    if (hf_case_load_with_studies(path, &m, &sl, &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_int_equal(m.nlines, 4);
    assert_true(hf_model_water_height(&m) >= 4.0 && m.site.depth <= 8.0);
    for (size_t i = 0; i < m.nlines; i++)
        assert_int_equal(m.lines[i].anchor_spec.kind, HF_ANCHOR_GRAVITY);
    assert_string_equal(m.criteria.preset, "ufc-4-159-03");
    int tide = 0;
    for (size_t i = 0; i < sl.n; i++)
        if (sl.v[i].kind == HF_STUDY_SWEEP && !strcmp(sl.v[i].vary[0].path, "site.water_level"))
            tide = 1;
    assert_true(tide);
    hf_study_list_free(&sl);
    hf_model_free(&m);

    hf_test_root_path(path, sizeof path, "cases/student.yaml");
    if (hf_case_load(path, &m, &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_int_equal(m.nlines, 1);
    hf_model_free(&m);
}

/* The minimal case skeleton printed in docs/case-format.md loads as it is
 * (issue 12 item 18: the docs had none; this keeps it valid). */
static void docs_skeleton_loads(void **state)
{
    (void)state;
    char path[4096];
    hf_test_root_path(path, sizeof path, "docs/case-format.md");
    size_t n;
    char *doc = hf_test_file_read(path, &n);
    assert_non_null(doc);
    char *a = strstr(doc, "## A minimal case");
    assert_non_null(a);
    a = strstr(a, "```yaml\n");
    assert_non_null(a);
    a += 8;
    char *b = strstr(a, "```");
    assert_non_null(b);
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (hf_case_load_buffer(a, (size_t)(b - a), "case-format.md", &m, &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_int_equal(m.nlines, 1);
    assert_int_equal(m.ncomponents, 1);
    hf_model_free(&m);
    free(doc);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(minimal_case_is_valid), cmocka_unit_test(malformed_table),
        cmocka_unit_test(limits_named),          cmocka_unit_test(aliases_expand),
        cmocka_unit_test(unreadable_file),       cmocka_unit_test(full_case_loads),
        cmocka_unit_test(docs_skeleton_loads),   cmocka_unit_test(allocation_failures),
        cmocka_unit_test(demo_cases_load),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
