/* cmd_check.c - 'holdfast check': validate a case and show what it resolves to. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/cli.h"
#include "holdfast/criteria.h"
#include "holdfast/results.h"
#include "holdfast/spread.h"

static const char help[] =
    "usage: holdfast check CASE\n"
    "\n"
    "Reads the case file CASE, checks every value (types, units, ranges, names) and\n"
    "prints what the case resolves to: the site, each component with every property\n"
    "marked as given in the file or derived (and from which formula), the lines with\n"
    "their sections, the hull, the load cases, the criteria and the studies.\n"
    "Nothing is solved and no file is written.\n"
    "\n"
    "options:\n"
    "  -h, --help   show this text\n"
    "\n"
    "exit status: 0 the case is valid, 2 bad input or usage (the message names\n"
    "FILE:LINE:COLUMN, the key path and what was expected)\n";

static const char *const anchor_kinds[] = {"drag", "gravity", "pile", "plate"};

/* A property value in the unit people read it in. */
static void print_prop(const hf_component *c, hf_component_prop p)
{
    double v = c->value[p];
    char buf[48];
    switch (p) {
    case HF_PROP_MASS:
        snprintf(buf, sizeof buf, "%.2f kg/m", v);
        break;
    case HF_PROP_WET_WEIGHT:
        snprintf(buf, sizeof buf, "%.4g kN/m", v / 1e3);
        break;
    case HF_PROP_EA:
        snprintf(buf, sizeof buf, "%.1f MN", v / 1e6);
        break;
    case HF_PROP_MBL:
        snprintf(buf, sizeof buf, "%.1f kN", v / 1e3);
        break;
    default:
        snprintf(buf, sizeof buf, "%.2f", v);
        break;
    }
    int given = (c->given >> p) & 1u;
    printf("    %-16s %-14s %s\n", hf_component_prop_name(p), buf,
           given ? "given in the case file" : (c->source[p] ? c->source[p] : "derived"));
}

static void print_components(const hf_model *m)
{
    int approx = 0;
    printf("\ncomponents (%zu)\n", m->ncomponents);
    for (size_t i = 0; i < m->ncomponents; i++) {
        const hf_model_component *mc = &m->components[i];
        const hf_component *c = &mc->comp;
        printf("  %s: %s", mc->name, hf_component_type_name(c->type));
        if (c->grade != HF_GRADE_NONE)
            printf(", grade %s", hf_component_grade_name(c->grade));
        if (c->diameter > 0.0)
            printf(", diameter %.1f mm", c->diameter * 1e3);
        printf("   (defined at %d:%d)\n", mc->src_line, mc->src_col);
        for (int p = 0; p < HF_PROP_COUNT; p++)
            print_prop(c, (hf_component_prop)p);
        if (c->approximate) {
            approx = 1;
            printf("    ! approximate: some values come from rough catalogue formulas for %s;\n"
                   "      enter the manufacturer's certified data (mass, wet_weight,\n"
                   "      axial_stiffness, breaking_load) before relying on results\n",
                   hf_component_type_name(c->type));
        }
    }
    if (approx)
        printf("  Wire and fibre rope properties vary widely between makers and constructions.\n");
}

static void print_lines(const hf_model *m)
{
    printf("\nlines (%zu)\n", m->nlines);
    hf_pose rest;
    hf_spread_pose_rest(m, &rest);
    for (size_t i = 0; i < m->nlines; i++) {
        const hf_model_line *l = &m->lines[i];
        /* span and fairlead height at the rest pose, from the spread's geometry */
        hf_spread_geom g;
        double span = NAN, height = NAN;
        if (hf_spread_line_geometry(m, i, &rest, &g, NULL) == HF_OK) {
            span = g.x;
            height = g.z;
        }
        printf("  %s: %s anchor at (%.1f, %.1f) m, fairlead (%.2f, %.2f, %.2f) m;\n"
               "    at rest: span %.1f m, fairlead %.2f m above the seabed, line length %.1f m\n",
               l->name, anchor_kinds[l->anchor_spec.kind], l->anchor[0], l->anchor[1],
               l->fairlead[0], l->fairlead[1], l->fairlead[2], span, height,
               hf_line_length(&l->line));
        if (isfinite(span))
            hf_results_stretch_warn(stderr, "check", l->name, &g, &l->line);
        if (l->anchor_spec.kind == HF_ANCHOR_GRAVITY)
            printf("    gravity block: submerged weight %.1f kN, friction %.2f\n",
                   l->anchor_spec.weight / 1e3, l->anchor_spec.friction);
        else if (l->anchor_spec.kind == HF_ANCHOR_DRAG)
            printf("    allowed uplift angle at the anchor: %.1f deg\n",
                   l->anchor_spec.max_uplift_angle * 180.0 / M_PI);
        printf("    sections (anchor first):");
        for (size_t k = 0; k < l->npieces; k++) {
            const hf_piece *p = &l->pieces[k];
            if (p->kind == HF_PIECE_SECTION)
                printf(" %s%s %.1f m", k ? "| " : "", m->components[p->component].name, p->length);
            else
                printf(" %s%s %.1f kN", k ? "| " : "", p->kind == HF_PIECE_CLUMP ? "clump" : "buoy",
                       p->load / 1e3);
        }
        printf("\n");
    }
}

/* "\n<what>: none" or "\n<what> (n)": the heading of a list; returns n. */
static size_t list_heading(const char *what, size_t n)
{
    if (n == 0)
        printf("\n%s: none\n", what);
    else
        printf("\n%s (%zu)\n", what, n);
    return n;
}

static void print_loads(const hf_model *m)
{
    if (list_heading("loads", m->nloads) == 0)
        return;
    for (size_t i = 0; i < m->nloads; i++) {
        const hf_load *ld = &m->loads[i];
        printf("  %s: force %.1f kN toward %.1f deg, yaw moment %.1f kN m\n", ld->name,
               ld->force / 1e3, ld->direction * 180.0 / M_PI, ld->moment / 1e3);
        for (size_t k = 0; k < ld->ndrag; k++) {
            const hf_drag *d = &ld->drag[k];
            double f = 0.0;
            (void)hf_drag_force(d, &f, NULL, NULL, NULL); /* 1/2 rho C A V^2, balance.h */
            /* Air and water are told apart by density alone (1.2 vs ~1000 kg/m^3). */
            printf("    %s drag: %.2f m/s toward %.1f deg, C %.2f, A %.1f m^2, rho %.4g kg/m^3"
                   " -> %.1f kN\n",
                   d->density < 100.0 ? "air" : "water", d->speed, d->direction * 180.0 / M_PI,
                   d->coefficient, d->area, d->density, f / 1e3);
        }
    }
}

static void print_rest(const hf_model *m, const hf_study_list *sl)
{
    const hf_hull *h = &m->hull;
    printf("\nhull: reference point at (%.2f, %.2f) m, heading %.2f deg", h->position[0],
           h->position[1], h->heading * 180.0 / M_PI);
    if (h->noutline)
        printf(", outline of %zu points", h->noutline);
    printf("\n");
    print_loads(m);
    const hf_criteria *c = &m->criteria;
    printf("\ncriteria: %s, %s analysis\n", c->preset ? c->preset : "no preset",
           c->analysis == HF_ANALYSIS_DYNAMIC ? "dynamic" : "quasi-static");
    if (c->factor_intact > 0.0)
        printf("  required MBL/T intact %.2f", c->factor_intact);
    else
        printf("  no intact line check");
    if (c->factor_damaged > 0.0)
        printf(", one line broken %.2f", c->factor_damaged);
    if (c->max_offset > 0.0)
        printf(", offset limit %.2f m", c->max_offset);
    printf("\n  source: %s\n", c->source ? c->source : "none");
    hf_cmd_design_check_print(m); /* issue 14: cmd_design.c */
    if (list_heading("studies", sl->n) == 0)
        return;
    for (size_t i = 0; i < sl->n; i++) {
        const hf_study *s = &sl->v[i];
        printf("  %-20s %-9s", s->name, hf_study_kind_name(s->kind));
        if (s->kind == HF_STUDY_SWEEP || s->kind == HF_STUDY_INVERT)
            for (size_t k = 0; k < s->nvary; k++)
                printf("%s%s", k ? ", " : " varies ", s->vary[k].path);
        if (s->kind == HF_STUDY_INVERT)
            printf(" for %s%s%s", s->target_output, s->target_line ? " of " : "",
                   s->target_line ? s->target_line : "");
        printf("\n");
    }
}

int hf_cmd_check(int argc, char **argv)
{
    const char *path = NULL;
    int rc = hf_cli_parse_case_args(argc, argv, "check", help, NULL, 0, &path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_model m;
    hf_study_list sl;
    rc = hf_cli_case_load_studies(path, &m, &sl);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    printf("case: %s\n", path);
    if (m.title)
        printf("title: %s\n", m.title);
    printf("site: depth %.2f m below the datum, water level %+.2f m (still water %.2f m above "
           "the seabed), water density %.1f kg/m^3\n",
           m.site.depth, m.site.water_level, hf_model_water_height(&m), m.site.water_density);
    print_components(&m);
    print_lines(&m);
    print_rest(&m, &sl);
    printf("\nthe case is valid: %zu components, %zu lines, %zu load cases, %zu studies\n\n%s",
           m.ncomponents, m.nlines, m.nloads, sl.n, hf_caution_text);
    hf_study_list_free(&sl);
    hf_model_free(&m);
    return HF_EXIT_OK;
}
