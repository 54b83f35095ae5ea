/* test_model.c - the model: init/free/copy, resolve, finds, parameter paths (lookup/get/set). */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include <cmocka.h>
#include "support.h"
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/model.h"

#define G_N 9.80665 /* standard gravity, m/s^2 (NIST SP 811) */

static const char text[] =
    "title: two lines at the invented Colder Sound\n"
    "site: {depth: 62.5 m, water_level: 1.7 m}\n"
    "components:\n"
    "  ch: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
    "  wr: {type: spiral_strand, diameter: 64 mm, breaking_load: 3.9 MN}\n"
    "hull: {position: [3, 4], heading: 10 deg}\n"
    "lines:\n"
    "  - name: east\n"
    "    anchor: [603, 4]\n"
    "    fairlead: [10, 0, -6.5]\n"
    "    sections:\n"
    "      - {component: ch, length: 240 m}\n"
    "      - {clump: 45 kN}\n"
    "      - {component: wr, length: 330 m}\n"
    "      - {buoy: 12.5 kN, friction: 0.3}\n"
    "      - {component: ch, length: 60 m}\n"
    "  - name: west\n"
    "    anchor: [-587, 4]\n"
    "    fairlead: [-10, 0, -6.5]\n"
    "    sections: [{component: ch, length: 640 m}]\n"
    "loads:\n"
    "  - {name: storm, force: 380 kN, direction: 200 deg, moment: 1.5 MN*m}\n"
    "criteria: {preset: iso-19901-7}\n"
    "studies:\n"
    "  - name: sw\n"
    "    kind: sweep\n"
    "    vary: [{path: \"lines[east].sections[1].clump\", values: [10 kN, 20 kN]}]\n"
    "    outputs: [max_utilisation]\n";

static void load(hf_model *m)
{
    hf_error err;
    hf_model_init(m);
    if (hf_case_load_buffer(text, strlen(text), "m.yaml", m, &err) != HF_OK)
        fail_msg("%s", err.text);
}

static void init_free_and_finds(void **state)
{
    (void)state;
    hf_model m;
    hf_model_init(&m);
    assert_int_equal(m.nlines, 0);
    HF_TEST_ASSERT_NEAR(m.site.water_density, 1025.0, 0);
    hf_model_free(&m);
    hf_model_free(NULL);
    load(&m);
    HF_TEST_ASSERT_NEAR(hf_model_water_height(&m), 64.2, 1e-12);
    assert_int_equal(hf_model_line_find(&m, "west"), 1);
    assert_int_equal(hf_model_line_find(&m, "West"), (size_t)-1);
    assert_int_equal(hf_model_line_find(&m, NULL), (size_t)-1);
    assert_int_equal(hf_model_component_find(&m, "wr"), 1);
    assert_int_equal(hf_model_component_find(&m, "w"), (size_t)-1);
    assert_int_equal(hf_model_load_find(&m, "storm"), 0);
    assert_int_equal(hf_model_load_find(&m, "calm"), (size_t)-1);
    hf_model_free(&m);
    assert_int_equal(m.nlines, 0);
    assert_null(m.lines);
}

static void resolve_builds_lines(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    load(&m);
    const hf_line *l = &m.lines[0].line;
    assert_int_equal(l->n, 3);
    HF_TEST_ASSERT_NEAR(l->joint[0].load, 45e3, 1e-9);
    HF_TEST_ASSERT_NEAR(l->joint[1].load, -12.5e3, 1e-9);
    /* a joint with a buoy only is never grounded: no clump, no friction */
    HF_TEST_ASSERT_NEAR(l->joint[1].friction, 0.0, 0);
    HF_TEST_ASSERT_NEAR(l->sec[1].mbl, 3.9e6, 1e-6);
    /* chain wet weight = 0.0199 d^2 g (1 - 1025/7850) (REFERENCE.md section 3:
     * catalogue mass, steel 7850 kg/m^3 from memory, sea water 1025 kg/m^3) */
    HF_TEST_ASSERT_NEAR(l->sec[0].weight, 0.0199 * 76 * 76 * G_N * (1 - 1025.0 / 7850.0), 1e-6);
    HF_TEST_ASSERT_NEAR(hf_line_length(l), 630.0, 1e-9);

    /* hand-made changes to the pieces are validated by resolve */
    m.lines[1].pieces[0].length = -4.25;
    assert_int_equal(hf_model_resolve(&m, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "lines[west].sections[0].length: expected a positive length"));
    m.lines[1].pieces[0].length = 640.0;
    m.lines[0].pieces[3].kind = HF_PIECE_SECTION; /* the buoy becomes a chain ... */
    m.lines[0].pieces[3].component = 0;
    m.lines[0].pieces[3].length = 12.5;
    m.lines[0].pieces[4].kind = HF_PIECE_CLUMP; /* ... and the last chain a clump */
    m.lines[0].pieces[4].load = 9.0e3;
    m.lines[0].pieces[4].friction = 0.7;
    assert_int_equal(hf_model_resolve(&m, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "lines[east].sections[4]: a clump or buoy must sit between"));
    assert_non_null(strstr(err.text, "fairlead end"));
    m.lines[0].pieces[0].kind = HF_PIECE_BUOY;
    m.lines[0].pieces[0].load = 2e3;
    assert_int_equal(hf_model_resolve(&m, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "lines[east].sections[0]"));
    assert_non_null(strstr(err.text, "anchor end"));
    hf_model_free(&m);

    load(&m);
    m.site.depth = 0.0;
    assert_int_equal(hf_model_resolve(&m, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "site.depth"));
    m.site.depth = 62.5;
    m.site.water_density = NAN;
    assert_int_equal(hf_model_resolve(&m, &err), HF_EINVAL);
    m.site.water_density = 1025.0;
    m.lines[1].fairlead[2] = -70.0;
    assert_int_equal(hf_model_resolve(&m, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "lines[west].fairlead: expected a fairlead above the seabed"));
    m.lines[1].fairlead[2] = -6.5;
    assert_int_equal(hf_model_resolve(&m, &err), HF_OK);
    hf_model_free(&m);
}

static void copy_is_deep(void **state)
{
    (void)state;
    hf_model a, b;
    hf_error err;
    load(&a);
    assert_int_equal(hf_model_copy(&b, &a), HF_OK);
    assert_int_equal(b.nlines, 2);
    assert_ptr_not_equal(b.lines, a.lines);
    assert_ptr_not_equal(b.lines[0].pieces, a.lines[0].pieces);
    assert_ptr_not_equal(b.lines[0].name, a.lines[0].name);
    assert_string_equal(b.lines[0].name, "east");
    assert_string_equal(b.title, a.title);
    assert_string_equal(b.criteria.preset, "iso-19901-7");
    HF_TEST_ASSERT_NEAR(b.loads[0].moment, 1.5e6, 1e-6);
    HF_TEST_ASSERT_NEAR(b.lines[0].line.joint[0].load, 45e3, 1e-9);
    /* changing the copy leaves the source alone */
    hf_param p;
    assert_int_equal(hf_model_param_lookup(&b, "lines[east].sections[1].clump", &p, &err), HF_OK);
    assert_int_equal(hf_model_param_set(&b, &p, 61.5e3, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(b.lines[0].line.joint[0].load, 61.5e3, 1e-9);
    HF_TEST_ASSERT_NEAR(a.lines[0].line.joint[0].load, 45e3, 1e-9);
    hf_model_free(&b);

    /* every allocation failure: HF_ENOMEM and an empty destination */
    long n;
    for (n = 1; n < 10000; n++) {
        hf_alloc_fail_at(n, 0);
        hf_status st = hf_model_copy(&b, &a);
        hf_alloc_fail_at(0, 0);
        if (st == HF_OK)
            break;
        assert_int_equal(st, HF_ENOMEM);
        assert_int_equal(b.nlines, 0);
        assert_null(b.title);
    }
    /* 13 blocks: title, path, preset, the component, line and load arrays
     * with their names, pieces and drag terms: every one was made to fail */
    assert_true(n > 13);
    hf_model_free(&b);
    hf_model_free(&a);

    hf_model_init(&a);
    assert_int_equal(hf_model_copy(&b, &a), HF_OK); /* empty model */
    assert_int_equal(b.nlines, 0);
    hf_model_free(&b);
}

typedef struct {
    const char *path;
    hf_dim dim;
    double value; /* expected SI value from the case text */
} path_case;

static void lookup_every_path_form(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    load(&m);
    const hf_component *ch = &m.components[0].comp;
    const path_case ok[] = {
        {"site.depth", HF_DIM_LENGTH, 62.5},
        {"site.water_level", HF_DIM_LENGTH, 1.7},
        {"site.water_density", HF_DIM_DENSITY, 1025.0},
        {"components.ch.diameter", HF_DIM_LENGTH, 0.076},
        {"components[ch].diameter", HF_DIM_LENGTH, 0.076},
        {"components.ch.mass", HF_DIM_MASS_PER_LENGTH, ch->value[HF_PROP_MASS]},
        {"components.ch.wet_weight", HF_DIM_FORCE_PER_LENGTH, ch->value[HF_PROP_WET_WEIGHT]},
        {"components.ch.axial_stiffness", HF_DIM_FORCE, ch->value[HF_PROP_EA]},
        {"components.wr.breaking_load", HF_DIM_FORCE, 3.9e6},
        {"components.ch.seabed_friction", HF_DIM_NONE, 1.0},
        {"lines[east].sections[0].length", HF_DIM_LENGTH, 240.0},
        {"lines[0].sections[2].length", HF_DIM_LENGTH, 330.0},
        {"lines[east].sections[1].clump", HF_DIM_FORCE, 45e3},
        {"lines[east].sections[3].buoy", HF_DIM_FORCE, 12.5e3},
        {"lines[1].sections[0].length", HF_DIM_LENGTH, 640.0},
        /* anchor radius from the hull reference point (3, 4): 600 m and 590 m */
        {"lines[east].anchor_radius", HF_DIM_LENGTH, 600.0},
        {"lines[west].anchor_radius", HF_DIM_LENGTH, 590.0},
        {"lines[west].anchor.x", HF_DIM_LENGTH, -587.0},
        {"lines[west].anchor.y", HF_DIM_LENGTH, 4.0},
        {"lines[east].fairlead.x", HF_DIM_LENGTH, 10.0},
        {"lines[east].fairlead.y", HF_DIM_LENGTH, 0.0},
        {"lines[1].fairlead.z", HF_DIM_LENGTH, -6.5},
        {"loads[storm].force", HF_DIM_FORCE, 380e3},
        {"loads.storm.direction", HF_DIM_ANGLE, 200.0 * M_PI / 180.0},
        {"loads[0].moment", HF_DIM_MOMENT, 1.5e6},
        {"hull.heading", HF_DIM_ANGLE, 10.0 * M_PI / 180.0},
        {"hull.position.x", HF_DIM_LENGTH, 3.0},
        {"hull.position.y", HF_DIM_LENGTH, 4.0},
    };
    for (size_t i = 0; i < sizeof ok / sizeof ok[0]; i++) {
        hf_param p;
        hf_error_clear(&err);
        if (hf_model_param_lookup(&m, ok[i].path, &p, &err) != HF_OK)
            fail_msg("%s: %s", ok[i].path, err.text);
        if (p.dim != ok[i].dim)
            fail_msg("%s: dimension %d, expected %d", ok[i].path, (int)p.dim, (int)ok[i].dim);
        double v = 0.0;
        if (hf_model_param_get(&m, &p, &v, &err) != HF_OK)
            fail_msg("%s: %s", ok[i].path, err.text);
        if (!(fabs(v - ok[i].value) <= 1e-9 * fmax(1.0, fabs(ok[i].value))))
            fail_msg("%s = %.12g, expected %.12g", ok[i].path, v, ok[i].value);
    }
    const struct {
        const char *path, *frag;
    } no[] = {
        {"site.dept", "unknown site parameter"},
        {"site", "unknown parameter"},
        {"", "unknown parameter"},
        {"hull.heading.x", "unknown parameter"},
        {"components.chain.diameter", "no component named \"chain\""},
        {"components.ch.colour", "unknown component property"},
        {"components.ch", "unknown component property"},
        {"lines.east.anchor.x", "expected lines[NAME] or lines[INDEX]"},
        {"lines[north].anchor.x", "no line named \"north\""},
        {"lines[2].anchor.x", "the case has 2 lines, got index 2"},
        {"lines[east].anchor.z", "unknown line parameter"},
        {"lines[east].fairlead.w", "unknown line parameter"},
        {"lines[east].sections[6].length", "has 5 sections entries (0..4), got index 6"},
        {"lines[east].sections[-1].length", "0-based index"},
        {"lines[east].sections[x].length", "0-based index"},
        {"lines[east].sections[1].length",
         "sections[1] of line east is a clump; expected \"clump\""},
        {"lines[east].sections[3].clump", "is a buoy; expected \"buoy\""},
        {"lines[east].sections[0].clump", "is a component section; expected \"length\""},
        {"lines[east", "expected lines[NAME] or lines[INDEX]"},
        {"loads[calm].force", "no load named \"calm\""},
        {"loads[storm].speed", "unknown load parameter"},
    };
    for (size_t i = 0; i < sizeof no / sizeof no[0]; i++) {
        hf_param p;
        hf_error_clear(&err);
        hf_status st = hf_model_param_lookup(&m, no[i].path, &p, &err);
        if (st != HF_EINVAL || !strstr(err.text, no[i].frag))
            fail_msg("%s: status %d, message \"%s\", expected \"%s\"", no[i].path, (int)st,
                     err.text, no[i].frag);
    }
    hf_model_free(&m);
}

static double get(hf_model *m, const char *path)
{
    hf_param p;
    hf_error err;
    if (hf_model_param_lookup(m, path, &p, &err) != HF_OK)
        fail_msg("%s", err.text);
    double v = 0.0;
    if (hf_model_param_get(m, &p, &v, &err) != HF_OK)
        fail_msg("%s: %s", path, err.text);
    return v;
}

static hf_status set(hf_model *m, const char *path, double v, hf_error *err)
{
    hf_param p;
    if (hf_model_param_lookup(m, path, &p, err) != HF_OK)
        fail_msg("%s", err->text);
    return hf_model_param_set(m, &p, v, err);
}

static void set_rederives(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    load(&m);
    /* diameter: the R3 MBL formula 0.0223 d^2 (44 - 0.08 d) kN follows
     * (DNV-OS-E302 / IACS UR W22, REFERENCE.md section 3; 84 mm) */
    assert_int_equal(set(&m, "components.ch.diameter", 0.084, &err), HF_OK);
    double mbl84 = 0.0223 * 84 * 84 * (44 - 0.08 * 84) * 1e3;
    HF_TEST_ASSERT_NEAR(m.components[0].comp.value[HF_PROP_MBL], mbl84, 1e-6);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[0].mbl, mbl84, 1e-6);
    HF_TEST_ASSERT_NEAR(m.lines[1].line.sec[0].mbl, mbl84, 1e-6);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[2].mbl, mbl84, 1e-6);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].mbl, 3.9e6, 1e-6); /* the wire is not the chain */

    /* a given mass stays given; the wet weight is derived from it */
    assert_int_equal(set(&m, "components.ch.mass", 152.75, &err), HF_OK);
    assert_true(m.components[0].comp.given & (1u << HF_PROP_MASS));
    HF_TEST_ASSERT_NEAR(m.lines[1].line.sec[0].weight, 152.75 * G_N * (1 - 1025.0 / 7850.0), 1e-6);
    assert_int_equal(set(&m, "components.ch.diameter", 0.0735, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(get(&m, "components.ch.mass"), 152.75, 1e-12);

    assert_int_equal(set(&m, "components.wr.wet_weight", 318.5, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].weight, 318.5, 1e-12);
    assert_int_equal(set(&m, "components.wr.axial_stiffness", 3.45e8, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].ea, 3.45e8, 1e-3);
    assert_int_equal(set(&m, "components.wr.seabed_friction", 0.0, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].friction, 0.0, 0);
    assert_int_equal(set(&m, "components.wr.breaking_load", 4.15e6, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].mbl, 4.15e6, 1e-6);

    /* water density changes every derived wet weight: w = m g (1 - rho/7850) */
    assert_int_equal(set(&m, "site.water_density", 1000.0, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[1].line.sec[0].weight, 152.75 * G_N * (1 - 1000.0 / 7850.0), 1e-6);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].weight, 318.5, 1e-12); /* given stays */

    /* sections, clumps and buoys */
    assert_int_equal(set(&m, "lines[east].sections[2].length", 287.25, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[1].length, 287.25, 1e-12);
    assert_int_equal(set(&m, "lines[east].sections[3].buoy", 7.75e3, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.joint[1].load, -7.75e3, 1e-9);

    /* anchor radius moves the anchor along its bearing from the hull reference point */
    assert_int_equal(set(&m, "lines[west].anchor_radius", 512.5, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.lines[1].anchor[0], 3.0 - 512.5, 1e-9);
    HF_TEST_ASSERT_NEAR(m.lines[1].anchor[1], 4.0, 1e-9);
    HF_TEST_ASSERT_NEAR(get(&m, "lines[west].anchor_radius"), 512.5, 1e-9);

    assert_int_equal(set(&m, "site.depth", 71.25, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(hf_model_water_height(&m), 72.95, 1e-12);
    assert_int_equal(set(&m, "lines[0].fairlead.z", -2.5, &err), HF_OK);
    assert_int_equal(set(&m, "lines[0].anchor.y", 17.0, &err), HF_OK);
    assert_int_equal(set(&m, "loads[storm].force", 0.0, &err), HF_OK);
    assert_int_equal(set(&m, "loads[storm].direction", -1.25, &err), HF_OK);
    assert_int_equal(set(&m, "loads[storm].moment", -3.5e5, &err), HF_OK);
    assert_int_equal(set(&m, "hull.heading", 0.35, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.hull.heading, 0.35, 0);
    assert_int_equal(set(&m, "hull.position.y", -8.0, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(m.hull.position[1], -8.0, 0);
    hf_model_free(&m);
}

static void set_refuses_invalid_values(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    load(&m);
    const struct {
        const char *path;
        double value;
        const char *frag;
    } bad[] = {
        {"site.depth", -3.5, "expected a positive length"},
        {"site.depth", 0.0, "expected a positive length"},
        {"site.depth", NAN, "expected a finite value"},
        {"site.depth", INFINITY, "expected a finite value"},
        {"site.depth", 4.75, "fairlead above the seabed"}, /* 6.45 m < 6.5 m */
        {"site.water_level", -57.5, "fairlead above the seabed"},
        {"site.water_level", -80.0, "above -depth"},
        {"site.water_density", -1.0, "expected a positive density"},
        {"components.ch.diameter", 0.0, "expected a positive length"},
        {"components.ch.diameter", 0.9, "components.ch"}, /* outside the chain range */
        {"components.ch.mass", -140.0, "expected a positive mass"},
        {"components.ch.seabed_friction", -0.1, "non-negative seabed_friction"},
        {"lines[east].sections[0].length", -240.0, "expected a positive length"},
        {"lines[east].sections[1].clump", 0.0, "expected a positive force"},
        {"lines[east].anchor_radius", -1.0, "positive anchor radius"},
        {"lines[east].fairlead.z", -66.0, "fairlead above the seabed"},
        {"loads[storm].force", -1.0, "expected a load force >= 0"},
        {"hull.heading", NAN, "expected a finite value"},
    };
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        double before = get(&m, bad[i].path);
        hf_error_clear(&err);
        hf_status st = set(&m, bad[i].path, bad[i].value, &err);
        if (st != HF_EINVAL || !strstr(err.text, bad[i].frag))
            fail_msg("%s = %g: status %d, message \"%s\", expected \"%s\"", bad[i].path,
                     bad[i].value, (int)st, err.text, bad[i].frag);
        /* the model is unchanged and still resolves */
        HF_TEST_ASSERT_NEAR(get(&m, bad[i].path), before, 0);
        assert_int_equal(hf_model_resolve(&m, &err), HF_OK);
    }
    HF_TEST_ASSERT_NEAR(m.lines[0].line.sec[0].length, 240.0, 0);
    HF_TEST_ASSERT_NEAR(m.lines[0].line.joint[0].load, 45e3, 0);

    /* an anchor right under the reference point has no radial direction */
    assert_int_equal(set(&m, "lines[west].anchor.x", 3.0, &err), HF_OK);
    assert_int_equal(set(&m, "lines[west].anchor.y", 4.0, &err), HF_OK);
    assert_int_equal(set(&m, "lines[west].anchor_radius", 100.0, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "no radial direction"));

    hf_param p;
    memset(&p, 0, sizeof p);
    assert_int_equal(hf_model_param_set(&m, &p, 1.0, &err), HF_EINVAL); /* never looked up */
    hf_model_free(&m);
}

/* loads[X].direction turns the whole load case (issue 12 item 1): a
 * rotation keeps the magnitude of the resultant force and the moment and
 * turns the resultant by the same angle (rotation of a sum of vectors is the
 * sum of the rotated vectors: linearity of rotation, any mechanics text). */
static void load_direction_turns_everything(void **state)
{
    (void)state;
    static const char yaml[] =
        "site: {depth: 40 m}\n"
        "components:\n  ch: {type: studless_chain, grade: R3, diameter: 64 mm}\n"
        "lines:\n  - {name: a, anchor: [300, 0], fairlead: [0, 0, -3],\n"
        "            sections: [{component: ch, length: 330 m}]}\n"
        "loads:\n"
        "  - name: mixed\n    force: 120 kN\n    direction: 35 deg\n"
        "    wind: {speed: 21.5 m/s, direction: 80 deg, coefficient: 0.95, area: 640 m^2}\n"
        "    current: {speed: 0.85 m/s, direction: 300 deg, coefficient: 1.1, area: 310 m^2}\n"
        "  - name: drag-only\n"
        "    wind: {speed: 18 m/s, direction: 270 deg, coefficient: 1.0, area: 500 m^2}\n"
        "    current: {speed: 0.7 m/s, direction: 250 deg, coefficient: 1.0, area: 300 m^2}\n";
    const double deg = M_PI / 180.0;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (hf_case_load_buffer(yaml, strlen(yaml), "d.yaml", &m, &err) != HF_OK)
        fail_msg("%s", err.text);
    for (size_t li = 0; li < 2; li++) {
        double f0[3], f1[3];
        assert_int_equal(hf_balance_load_force(&m.loads[li], f0, &err), HF_OK);
        char path[64];
        snprintf(path, sizeof path, "loads[%s].direction", m.loads[li].name);
        hf_param p;
        assert_int_equal(hf_model_param_lookup(&m, path, &p, &err), HF_OK);
        double d0;
        assert_int_equal(hf_model_param_get(&m, &p, &d0, &err), HF_OK);
        /* the load's direction: the direct force's, else the first drag term's (wind) */
        HF_TEST_ASSERT_NEAR(d0, li == 0 ? 35 * deg : 270 * deg, 1e-12);
        double turn = 117.5 * deg;
        assert_int_equal(hf_model_param_set(&m, &p, d0 + turn, &err), HF_OK);
        assert_int_equal(hf_balance_load_force(&m.loads[li], f1, &err), HF_OK);
        double c = cos(turn), s = sin(turn);
        HF_TEST_ASSERT_NEAR(f1[0], c * f0[0] - s * f0[1], 1e-9 * hypot(f0[0], f0[1]));
        HF_TEST_ASSERT_NEAR(f1[1], s * f0[0] + c * f0[1], 1e-9 * hypot(f0[0], f0[1]));
        HF_TEST_ASSERT_NEAR(f1[2], f0[2], 1e-9);
        double d1;
        assert_int_equal(hf_model_param_get(&m, &p, &d1, &err), HF_OK);
        HF_TEST_ASSERT_NEAR(d1, d0 + turn, 1e-12);
    }
    /* a parameter that was not looked up is a failure, not a plausible 0.0
     * (issue 11 item 5) */
    {
        hf_param none;
        memset(&none, 0, sizeof none);
        double v = 2.385;
        assert_int_equal(hf_model_param_get(&m, &none, &v, &err), HF_EINVAL);
        assert_true(v == 2.385); /* left untouched */
        hf_param far;
        assert_int_equal(hf_model_param_lookup(&m, "loads[mixed].direction", &far, &err), HF_OK);
        far.index = 99; /* bound to another model */
        assert_int_equal(hf_model_param_get(&m, &far, &v, &err), HF_EINVAL);
    }
    /* a load without a direct force cannot have its force varied */
    hf_param p;
    assert_int_equal(hf_model_param_lookup(&m, "loads[drag-only].force", &p, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "has no direct force"));
    assert_int_equal(hf_model_param_lookup(&m, "loads[mixed].force", &p, &err), HF_OK);
    hf_model_free(&m);
}

/* A clump and a buoy at one joint: only the clump touches the seabed, so the
 * joint's friction coefficient is the clump's (weighted over clumps only),
 * applied by the line to the net normal force P = clump - buoy.  Statics of a
 * block on a frictional plane (Coulomb): drop = mu N = 0.8 x (120 - 70) kN =
 * 40 kN (docs/theory.md, "Point loads on the seabed"). */
static void clump_and_buoy_joint_friction(void **state)
{
    (void)state;
    static const char yaml[] =
        "site: {depth: 50 m}\n"
        "components:\n"
        "  c: {type: custom, wet_weight: 1 kN/m, axial_stiffness: 1000 MN, breaking_load: 5 MN}\n"
        "lines:\n"
        "  - name: one\n"
        "    anchor: [-400, 0]\n"
        "    fairlead: [0, 0, 0]\n"
        "    sections:\n"
        "      - {component: c, length: 200 m}\n"
        "      - {clump: 120 kN, friction: 0.8}\n"
        "      - {buoy: 70 kN, friction: 0.1}\n"
        "      - {component: c, length: 250 m}\n";
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (hf_case_load_buffer(yaml, strlen(yaml), "j.yaml", &m, &err) != HF_OK)
        fail_msg("%s", err.text);
    const hf_line *ln = &m.lines[0].line;
    HF_TEST_ASSERT_NEAR(ln->joint[0].load, 50e3, 1e-9);
    if (fabs(ln->joint[0].friction - 0.8) > 1e-15)
        fail_msg("joint friction %.6g, expected the clump's 0.8 (buoys do not touch the seabed)",
                 ln->joint[0].friction);
    HF_TEST_ASSERT_NEAR(ln->joint[0].friction * ln->joint[0].load, 40e3, 1e-9);
    hf_model_free(&m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(init_free_and_finds),
        cmocka_unit_test(resolve_builds_lines),
        cmocka_unit_test(copy_is_deep),
        cmocka_unit_test(lookup_every_path_form),
        cmocka_unit_test(set_rederives),
        cmocka_unit_test(set_refuses_invalid_values),
        cmocka_unit_test(load_direction_turns_everything),
        cmocka_unit_test(clump_and_buoy_joint_friction),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
