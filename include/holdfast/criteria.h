/* criteria.h - safety-factor presets, line utilisation checks, anchor checks.
 *
 * Flow: case -> model -> line solve -> spread -> balance -> **criteria**.
 * A named preset (API RP 2SK, ISO 19901-7, DNV-OS-E301-style partial factors,
 * UFC 4-159-03) fills the required line safety factors of an hf_criteria
 * (model.h); the user may then override any of them.  The checks here are
 * pure arithmetic on solved forces: they know nothing of solving, files or
 * printing.  docs/criteria.md lists every value with its source, and marks
 * the values recalled from memory.
 *
 * Safety factor convention: the line factor is MBL / T (minimum breaking load
 * over the largest tension in the line's most loaded section); a check passes
 * when that factor is >= the required factor.  Utilisation is T / MBL. */
#ifndef HOLDFAST_CRITERIA_H
#define HOLDFAST_CRITERIA_H

#include <stddef.h>
#include "holdfast/model.h"
#include "holdfast/status.h"

/* The valid preset names, for messages: "api-rp-2sk, iso-19901-7, ...". */
#define HF_CRITERIA_PRESET_NAMES "api-rp-2sk, iso-19901-7, dnv-cc1, dnv-cc2, ufc-4-159-03"

/* Anchor classes of a holding-capacity table (UFC 4-159-03 (2005) table
 * 3-7 lists one required factor on the ultimate holding capacity for each). */
typedef enum {
    HF_HOLDING_STOCKLESS = 0,   /* stockless and balanced-fluke anchors */
    HF_HOLDING_HIGH_EFFICIENCY, /* high-efficiency drag anchors */
    HF_HOLDING_PILE_PLATE,      /* pile and plate anchors */
    HF_HOLDING_SHIP,            /* a ship's own anchoring */
    HF_HOLDING_NCLASSES
} hf_holding_class;

/* One preset of required line safety factors (on MBL) with its source. */
typedef struct {
    const char *name;        /* "api-rp-2sk", ... */
    const char *title;       /* human title of the rule set */
    const char *source;      /* static text: document, edition, clause; "(from memory)"
                                where the value was not confirmed in the text */
    int from_memory;         /* 1 when any value was recalled, not read in the source
                                (the source text says which ones) */
    int damaged_from_memory; /* 1 when the one-line-broken factors were recalled */
    int uses_analysis;       /* 1 when the factors depend on quasi-static vs dynamic */
    double intact_qs;        /* required MBL/T, intact, quasi-static analysis */
    double damaged_qs;       /* required MBL/T, one line broken, quasi-static */
    double intact_dyn;       /* required MBL/T, intact, dynamic analysis */
    double damaged_dyn;      /* required MBL/T, one line broken, dynamic */
    /* Raw partial factors of the DNV-OS-E301-style presets (0 for the
     * others), kept visible because the equivalent factors above are our
     * conversion: required MBL/T = gamma_dyn / capacity (see criteria.c). */
    double gamma_mean;     /* ULS partial factor on mean tension, - */
    double gamma_dyn;      /* ULS partial factor on dynamic tension, - */
    double gamma_mean_als; /* ALS (one line broken) factor on mean tension, - */
    double gamma_dyn_als;  /* ALS factor on dynamic tension, - */
    double capacity;       /* characteristic capacity as a fraction of MBL, - */
    /* Further values of the preset's table (0 where the preset gives none);
     * table_source names where they were read. */
    double bend_factor;                  /* required MBL/T for chain around bends, intact, - */
    double wet_nylon_strength;           /* effective strength of wet nylon as a fraction of
                                            its (dry) break strength, - */
    double holding[HF_HOLDING_NCLASSES]; /* required ultimate holding capacity over
                                            the anchor load, per anchor class, - */
    const char *table_source;            /* static text, or NULL when the values above are all 0 */
} hf_criteria_preset;

/* Number of presets and the i-th one (i < count; NULL otherwise). */
size_t hf_criteria_preset_count(void);
const hf_criteria_preset *hf_criteria_preset_at(size_t i);

/* The preset named exactly `name`, or NULL (also for NULL). */
const hf_criteria_preset *hf_criteria_preset_find(const char *name);

/* Fills c->factor_intact, c->factor_damaged and c->source (static text) from
 * the preset named `preset`, honouring c->analysis (quasi-static or dynamic).
 * c->preset is not touched (the caller owns that string) and neither is
 * c->max_offset.  The case loader calls this while parsing `criteria:`; the
 * user's own intact/damaged factors overwrite the preset's afterwards.
 * Returns HF_OK, or HF_EINVAL (c unchanged) when c or preset is NULL or the
 * name is unknown; the message lists the valid names. */
hf_status hf_criteria_preset_apply(hf_criteria *c, const char *preset, hf_error *err);

/* Checks that a criteria record is usable: factors finite and >= 0 (0 = no
 * check; a non-zero factor below 1 is refused since it would accept tensions
 * above the breaking load; the same for the gravity-block factors, where 0
 * means the default 1.0), max_offset finite and >= 0.  HF_OK or HF_EINVAL
 * with a message naming the field. */
hf_status hf_criteria_check(const hf_criteria *c, hf_error *err);

/* Required MBL/T for a condition: c->factor_damaged when `damaged` is
 * non-zero, else c->factor_intact.  0 means no check.  c must not be NULL. */
double hf_criteria_required(const hf_criteria *c, int damaged);

/* Result of the line-strength check of one line. */
typedef struct {
    double tension;     /* largest tension in the most loaded section, N */
    double mbl;         /* that section's MBL, N */
    double utilisation; /* tension / mbl, - */
    double factor;      /* mbl / tension, -; 0 when the tension is 0 (see has_factor) */
    int has_factor;     /* 0 when the tension is 0 (the factor is unbounded) */
    double required;    /* required factor, - (0 = no check) */
    int checked;        /* 1 when required > 0 */
    int passed;         /* 1 when not checked or factor >= required (or tension 0) */
} hf_line_criterion;

/* Evaluates one line: tension (N, >= 0), mbl (N, > 0), required factor
 * (>= 0).  Returns HF_OK or HF_EINVAL (non-finite or out-of-range input;
 * *out is then zeroed). */
hf_status hf_criteria_line_evaluate(double tension, double mbl, double required,
                                    hf_line_criterion *out, hf_error *err);

/* Angle tolerance of the drag-anchor uplift check, rad: a line resting on
 * the seabed gives an exact 0, a suspended one a clearly positive angle. */
#define HF_CRITERIA_ANGLE_TOL 1e-6

/* Result of the anchor check of one line. */
typedef struct {
    hf_anchor_kind kind;
    double h;     /* horizontal force on the anchor, N (>= 0) */
    double v;     /* vertical uplift force on the anchor, N (>= 0) */
    double load;  /* resultant sqrt(h^2 + v^2), N */
    double angle; /* uplift angle atan2(v, h) above the horizontal, rad */
    /* drag anchors */
    double max_angle; /* allowed uplift angle, rad */
    /* gravity blocks (NAVFAC DM-7.02-style friction resistance) */
    double sliding_factor;   /* mu (W_sub - V) / H, - (0 when V >= W_sub) */
    int has_sliding;         /* 0 when H = 0 (nothing to slide it) */
    double uplift_factor;    /* W_sub / V, - */
    int has_uplift;          /* 0 when V = 0 */
    double required_sliding; /* required sliding factor used, - */
    double required_uplift;  /* required uplift factor used, - */
    int checked;             /* 1 when a pass/fail applies (drag, gravity); 0 piles, plates */
    int passed;              /* 1 when not checked or every applicable factor/angle holds */
    const char *note;        /* static text: what was checked and against what */
} hf_anchor_criterion;

/* Required factors for gravity blocks when the case gives none: 1.0, i.e.
 * only "the block does not move under the computed mean load".  This is an
 * equilibrium check, NOT a design margin; no published design factor is built
 * in (see docs/criteria.md): compare the reported factors with the governing
 * code. */
#define HF_CRITERIA_GRAVITY_SLIDING 1.0
#define HF_CRITERIA_GRAVITY_UPLIFT 1.0

/* Required gravity-block factors for anchor a under criteria c: the line's
 * own (a->required_*), else the case's (c->block_*), else the defaults
 * HF_CRITERIA_GRAVITY_* (1.0).  Either output may be NULL. */
void hf_criteria_block_required(const hf_criteria *c, const hf_anchor *a, double *sliding,
                                double *uplift);

/* The forces a solved line puts on its anchor for the anchor checks, N:
 * *h horizontal (toward the fairlead), *v upward.  As solved (s->anchor_h,
 * s->anchor_v) by default; with c->anchor_ignore_friction the seabed
 * friction of the grounded line is ignored: on the flat seabed the only
 * horizontal force along the line is that friction, so the anchor then sees
 * the horizontal tension of the suspended part, the fairlead's s->h, and the
 * same vertical force (0 whenever part of the line is grounded).  The
 * conservative choice for anchor design. */
void hf_criteria_anchor_forces(const hf_criteria *c, const hf_line_state *s, double *h, double *v);

/* Evaluates the anchor of one line from the forces the line puts on it:
 * h (N, >= 0, toward the fairlead) and v (N, >= 0, upward).  Drag anchors
 * pass when the uplift angle is <= a->max_uplift_angle (+ tolerance); gravity
 * blocks pass when sliding and uplift factors reach required_sliding and
 * required_uplift (> 0; pass HF_CRITERIA_GRAVITY_* for the defaults); piles
 * and plates are reported without pass/fail.  Returns HF_OK or HF_EINVAL
 * (non-finite or negative input, a gravity block without positive weight or
 * with negative friction; *out is then zeroed). */
hf_status hf_criteria_anchor_evaluate(const hf_anchor *a, double h, double v,
                                      double required_sliding, double required_uplift,
                                      hf_anchor_criterion *out, hf_error *err);

/* ---- further table values of a preset (UFC 4-159-03 table 3-7) ---------
 * These take the preset record (hf_criteria_preset_find) so that a caller
 * uses them only where the case names a preset that gives them. */

/* Stable names of the holding classes: "stockless", "high-efficiency",
 * "pile-plate", "ship" ("unknown" for anything else). */
const char *hf_criteria_holding_class_name(hf_holding_class k);

/* The class named exactly `name` into *out: HF_OK, or HF_EINVAL with a
 * message listing the valid names (NULL name included). */
hf_status hf_criteria_holding_class_find(const char *name, hf_holding_class *out, hf_error *err);

/* Required MBL/T of a chain section led around a bend (a bending shoe, a
 * fairlead sheave or chain wheel) in the condition given: p->bend_factor
 * intact; with one line broken the same ratio to the straight-chain factor,
 * bend_factor * damaged / intact (holdfast's reading: the table has no
 * broken-member clause).  `required` is the straight-chain factor of the
 * condition (hf_criteria_required); the result is never below it.  Returns
 * `required` unchanged when p is NULL or gives no bend factor. */
double hf_criteria_bend_required(const hf_criteria_preset *p, double required, int damaged);

/* Effective breaking strength of a section, N: mbl (N, > 0) times
 * p->wet_nylon_strength for a wet nylon section (wet_nylon non-zero) when the
 * preset gives that reduction, else mbl.  HF_OK, or HF_EINVAL for a
 * non-finite or non-positive mbl (*out then 0). */
hf_status hf_criteria_effective_mbl(const hf_criteria_preset *p, double mbl, int wet_nylon,
                                    double *out, hf_error *err);

/* Result of the holding-capacity check of one anchor. */
typedef struct {
    hf_holding_class cls;
    double capacity; /* ultimate holding capacity, N */
    double load;     /* anchor load, N */
    double factor;   /* capacity / load, -; 0 when load is 0 (has_factor 0) */
    int has_factor;
    double required; /* required factor of the class, - (0 = not checked) */
    int checked;     /* 1 when required > 0 */
    int passed;      /* 1 when not checked or capacity >= required * load */
} hf_holding_criterion;

/* Checks an anchor's ultimate holding capacity (N, > 0, from the designer:
 * soil data or a pull test) against the anchor load (N, >= 0) with the factor
 * the preset gives for the anchor's class (0 when p is NULL or gives none:
 * reported, not checked).  HF_OK, or HF_EINVAL (non-finite or out-of-range
 * input, unknown class; *out then zeroed). */
hf_status hf_criteria_holding_evaluate(const hf_criteria_preset *p, hf_holding_class cls,
                                       double capacity, double load, hf_holding_criterion *out,
                                       hf_error *err);

/* Stable name of an anchor kind: "drag", "gravity", "pile", "plate". */
const char *hf_criteria_anchor_kind_name(hf_anchor_kind k);

/* 1 when a utilisation T/MBL means an overloaded line: the tension has
 * reached the minimum breaking load of a section (u >= 1; the trade's
 * definition of MBL).  The one rule behind every `alert` column, message and
 * figure mark; 0 for NaN. */
int hf_criteria_overloaded(double utilisation);

#endif
