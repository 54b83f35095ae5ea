/* component.c - the line component catalogue: derived properties and their sources. */
#include <math.h>
#include <string.h>
#include "holdfast/component.h"

/* Standard acceleration of gravity, m/s^2 (exact; NIST SP 811, 2008 edition). */
#define G_N 9.80665
/* Material densities, kg/m^3.  Steel 7850 (from memory, the usual structural
 * steel value); polyester (PET) 1380 and nylon (PA6/PA66) 1140 (from memory,
 * fibre densities). */
#define RHO_STEEL 7850.0
#define RHO_POLYESTER 1380.0
#define RHO_NYLON 1140.0

static const char *const type_names[HF_COMP_TYPE_COUNT] = {
    [HF_COMP_STUDLESS_CHAIN] = "studless_chain",
    [HF_COMP_STUDLINK_CHAIN] = "studlink_chain",
    [HF_COMP_SIX_STRAND] = "six_strand",
    [HF_COMP_SPIRAL_STRAND] = "spiral_strand",
    [HF_COMP_POLYESTER] = "polyester",
    [HF_COMP_NYLON] = "nylon",
    [HF_COMP_CUSTOM] = "custom",
};

static const char *const grade_names[HF_GRADE_COUNT] = {
    [HF_GRADE_NONE] = "none", [HF_GRADE_R3] = "R3",   [HF_GRADE_R3S] = "R3S",
    [HF_GRADE_R4] = "R4",     [HF_GRADE_R4S] = "R4S", [HF_GRADE_R5] = "R5",
    [HF_GRADE_1] = "1",       [HF_GRADE_2] = "2",     [HF_GRADE_3] = "3",
};

static const char *const prop_names[HF_PROP_COUNT] = {
    [HF_PROP_MASS] = "mass",
    [HF_PROP_WET_WEIGHT] = "wet_weight",
    [HF_PROP_EA] = "axial_stiffness",
    [HF_PROP_MBL] = "breaking_load",
    [HF_PROP_FRICTION] = "seabed_friction",
};

/* SI unit of each property, for messages. */
static const char *const prop_units[HF_PROP_COUNT] = {
    [HF_PROP_MASS] = "kg/m", [HF_PROP_WET_WEIGHT] = "N/m", [HF_PROP_EA] = "N",
    [HF_PROP_MBL] = "N",     [HF_PROP_FRICTION] = "",
};

/* Chain MBL constant c in MBL = c d^2 (44 - 0.08 d) kN, d in mm.
 * Offshore grades: DNV-OS-E302 / IACS UR W22 (secondary: quoted in
 * /work/shared/REFERENCE.md section 3).  Ship anchor chain grades 1, 2, 3:
 * IACS UR W18 (from memory). */
static const double mbl_c[HF_GRADE_COUNT] = {
    [HF_GRADE_R3] = 0.0223,  [HF_GRADE_R3S] = 0.0249, [HF_GRADE_R4] = 0.0274,
    [HF_GRADE_R4S] = 0.0304, [HF_GRADE_R5] = 0.0320,  [HF_GRADE_1] = 0.00981,
    [HF_GRADE_2] = 0.01373,  [HF_GRADE_3] = 0.01961,
};

static const char *const mbl_src[HF_GRADE_COUNT] = {
    [HF_GRADE_R3] = "derived: DNV-OS-E302 / IACS UR W22 MBL formula, grade R3",
    [HF_GRADE_R3S] = "derived: DNV-OS-E302 / IACS UR W22 MBL formula, grade R3S",
    [HF_GRADE_R4] = "derived: DNV-OS-E302 / IACS UR W22 MBL formula, grade R4",
    [HF_GRADE_R4S] = "derived: DNV-OS-E302 / IACS UR W22 MBL formula, grade R4S",
    [HF_GRADE_R5] = "derived: DNV-OS-E302 / IACS UR W22 MBL formula, grade R5",
    [HF_GRADE_1] = "derived: IACS UR W18 breaking load formula, grade 1 (from memory)",
    [HF_GRADE_2] = "derived: IACS UR W18 breaking load formula, grade 2 (from memory)",
    [HF_GRADE_3] = "derived: IACS UR W18 breaking load formula, grade 3 (from memory)",
};

/* Studless chain modulus E = (a - b d) 1e10 Pa, d in mm, on the area of two
 * bars A = 2 pi d^2 / 4: DNV-OS-E301 (2010-2015 editions; secondary, quoted
 * in REFERENCE.md section 3).  DNV gives lines for R3, R4 and R5; holdfast
 * uses the R3 line for R3S and the R4 line for R4S (the base grade each
 * strengthens), and the R3 line for ship grades 1, 2, 3 (approximate). */
static const double ea_a[HF_GRADE_COUNT] = {
    [HF_GRADE_R3] = 5.40, [HF_GRADE_R3S] = 5.40, [HF_GRADE_R4] = 5.45, [HF_GRADE_R4S] = 5.45,
    [HF_GRADE_R5] = 6.00, [HF_GRADE_1] = 5.40,   [HF_GRADE_2] = 5.40,  [HF_GRADE_3] = 5.40,
};
static const double ea_b[HF_GRADE_COUNT] = {
    [HF_GRADE_R3] = 0.0040,  [HF_GRADE_R3S] = 0.0040, [HF_GRADE_R4] = 0.0025,
    [HF_GRADE_R4S] = 0.0025, [HF_GRADE_R5] = 0.0033,  [HF_GRADE_1] = 0.0040,
    [HF_GRADE_2] = 0.0040,   [HF_GRADE_3] = 0.0040,
};
static const char *const ea_src[HF_GRADE_COUNT] = {
    [HF_GRADE_R3] = "derived: DNV-OS-E301 studless chain stiffness, R3 line",
    [HF_GRADE_R3S] = "derived: DNV-OS-E301 studless chain stiffness, R3 line used for R3S",
    [HF_GRADE_R4] = "derived: DNV-OS-E301 studless chain stiffness, R4 line",
    [HF_GRADE_R4S] = "derived: DNV-OS-E301 studless chain stiffness, R4 line used for R4S",
    [HF_GRADE_R5] = "derived: DNV-OS-E301 studless chain stiffness, R5 line",
    [HF_GRADE_1] = "approximate: DNV-OS-E301 studless R3 line used for ship grade 1",
    [HF_GRADE_2] = "approximate: DNV-OS-E301 studless R3 line used for ship grade 2",
    [HF_GRADE_3] = "approximate: DNV-OS-E301 studless R3 line used for ship grade 3",
};

/* Per-type catalogue constants (d in mm). */
typedef struct {
    const char *label;      /* for messages: "studless chain" */
    double dmin, dmax;      /* accepted nominal diameter, m */
    double rho;             /* material density for buoyancy, kg/m^3 */
    double mass_k;          /* mass = mass_k d^2 kg/m */
    double mbl_k;           /* wire and fibre: MBL = mbl_k d^2 kN */
    double ea_k;            /* wire: EA = ea_k d^2 kN; fibre: EA = ea_k MBL */
    double friction;        /* default axial seabed friction, - */
    bool approx;            /* mass, EA and MBL formulas are approximate */
    const char *mass_src;   /* mass from the diameter */
    const char *mass_w_src; /* mass from the given wet weight */
    const char *wet_src;    /* wet weight from the catalogue mass */
    const char *wet_m_src;  /* wet weight from the given mass */
    const char *mbl_src_k;  /* wire and fibre MBL */
    const char *ea_src_k;   /* wire EA from d, fibre EA from the derived MBL */
    const char *ea_src_m;   /* fibre EA from the given MBL */
    const char *fric_src;
} kind;

#define STEEL_WET "w = m g (1 - rho_water/7850), steel 7850 kg/m^3 (from memory)"
#define STEEL_MASS "m = w / (g (1 - rho_water/7850)), steel 7850 kg/m^3 (from memory)"
/* Wire: the mass per metre is taken as steel of 7850 kg/m^3 with flooded
 * voids (assumption; a sheathed strand is lighter in water). */
#define WIRE_WET "w = m g (1 - rho_water/7850), steel with flooded voids (assumption)"
#define WIRE_MASS "m = w / (g (1 - rho_water/7850)), steel with flooded voids (assumption)"
#define ENTER "approximate: enter manufacturer catalogue data"

static const kind kinds[HF_COMP_TYPE_COUNT] = {
    [HF_COMP_STUDLESS_CHAIN] =
        {
            .label = "studless chain",
            .dmin = 0.005,
            .dmax = 0.300,
            .rho = RHO_STEEL,
            .mass_k = 0.0199,
            .friction = 1.0,
            .mass_src = "derived: 0.0199 d^2 kg/m, studless chain catalogue practice (secondary)",
            .mass_w_src = "derived from the given wet weight: " STEEL_MASS,
            .wet_src = "derived: " STEEL_WET,
            .wet_m_src = "derived from the given mass: " STEEL_WET,
            .fric_src = "default: chain on the seabed 1.0 (static value, from memory)",
        },
    [HF_COMP_STUDLINK_CHAIN] =
        {
            .label = "studlink chain",
            .dmin = 0.005,
            .dmax = 0.300,
            .rho = RHO_STEEL,
            .mass_k = 0.0219,
            .friction = 1.0,
            .mass_src = "derived: 0.0219 d^2 kg/m, studlink chain catalogue practice (secondary)",
            .mass_w_src = "derived from the given wet weight: " STEEL_MASS,
            .wet_src = "derived: " STEEL_WET,
            .wet_m_src = "derived from the given mass: " STEEL_WET,
            /* EA = 1.01e11 d^2 N, d in m (from memory: the value quoted in open
             * mooring design literature for studlink chain). */
            .ea_src_k = "approximate, from memory: studlink EA = 1.01e11 d^2 N (d in m); "
                        "enter manufacturer data",
            .fric_src = "default: chain on the seabed 1.0 (static value, from memory)",
        },
    [HF_COMP_SIX_STRAND] =
        {
            .label = "six-strand wire rope",
            .dmin = 0.005,
            .dmax = 0.200,
            .rho = RHO_STEEL,
            .mass_k = 0.0040,
            .mbl_k = 0.7,
            .ea_k = 45.0,
            .friction = 0.6,
            .approx = true,
            .mass_src = ENTER " (six-strand mass 0.0040 d^2 kg/m, from memory)",
            .mass_w_src = "derived from the given wet weight: " WIRE_MASS,
            .wet_src = ENTER " (" WIRE_WET ")",
            .wet_m_src = "derived from the given mass: " WIRE_WET,
            .mbl_src_k = ENTER " (six-strand MBL 0.7 d^2 kN, from memory)",
            .ea_src_k = ENTER " (six-strand EA 45 d^2 kN, from memory)",
            .fric_src = "default: wire on the seabed 0.6 (static value, from memory)",
        },
    [HF_COMP_SPIRAL_STRAND] =
        {
            .label = "spiral-strand wire rope",
            .dmin = 0.005,
            .dmax = 0.200,
            .rho = RHO_STEEL,
            .mass_k = 0.0050,
            .mbl_k = 0.95,
            .ea_k = 95.0,
            .friction = 0.6,
            .approx = true,
            .mass_src = ENTER " (spiral-strand mass 0.0050 d^2 kg/m, from memory)",
            .mass_w_src = "derived from the given wet weight: " WIRE_MASS,
            .wet_src = ENTER " (" WIRE_WET ")",
            .wet_m_src = "derived from the given mass: " WIRE_WET,
            .mbl_src_k = ENTER " (spiral-strand MBL 0.95 d^2 kN, from memory)",
            .ea_src_k = ENTER " (spiral-strand EA 95 d^2 kN, from memory)",
            .fric_src = "default: wire on the seabed 0.6 (static value, from memory)",
        },
    /* Fibre: mass = fill x rho_fibre x pi d^2/4 with a fill factor of about
     * 0.65 (polyester) and 0.67 (nylon) of the nominal circle; MBL per d^2
     * and EA/MBL ratios from memory (polyester EA is 12-30 x MBL and load
     * dependent per open textbook practice; 20 chosen).  Friction 0.6: no
     * published value found; fibre rope should not lie on the seabed. */
    [HF_COMP_POLYESTER] =
        {
            .label = "polyester rope",
            .dmin = 0.010,
            .dmax = 0.400,
            .rho = RHO_POLYESTER,
            .mass_k = 0.00070,
            .mbl_k = 0.25,
            .ea_k = 20.0,
            .friction = 0.6,
            .approx = true,
            .mass_src = ENTER " (polyester mass 0.00070 d^2 kg/m, from memory)",
            .mass_w_src = "derived from the given wet weight: m = w / (g (1 - rho_water/1380)), "
                          "polyester 1380 kg/m^3 (from memory)",
            .wet_src = ENTER " (w = m g (1 - rho_water/1380), polyester 1380 kg/m^3, from memory)",
            .wet_m_src = "derived from the given mass: w = m g (1 - rho_water/1380), polyester "
                         "1380 kg/m^3 (from memory)",
            .mbl_src_k = ENTER " (polyester MBL 0.25 d^2 kN, from memory)",
            .ea_src_k = ENTER " (polyester EA 20 x MBL; 12-30 x MBL, load dependent)",
            .ea_src_m = "approximate: polyester EA 20 x the given MBL (12-30 x MBL, load "
                        "dependent); enter manufacturer catalogue data",
            .fric_src = "default: fibre rope 0.6 (holdfast choice, as wire; keep fibre off the "
                        "seabed)",
        },
    [HF_COMP_NYLON] =
        {
            .label = "nylon rope",
            .dmin = 0.010,
            .dmax = 0.400,
            .rho = RHO_NYLON,
            .mass_k = 0.00060,
            .mbl_k = 0.20,
            .ea_k = 5.0,
            .friction = 0.6,
            .approx = true,
            .mass_src = ENTER " (nylon mass 0.00060 d^2 kg/m, from memory)",
            .mass_w_src = "derived from the given wet weight: m = w / (g (1 - rho_water/1140)), "
                          "nylon 1140 kg/m^3 (from memory)",
            .wet_src = ENTER " (w = m g (1 - rho_water/1140), nylon 1140 kg/m^3, from memory)",
            .wet_m_src = "derived from the given mass: w = m g (1 - rho_water/1140), nylon "
                         "1140 kg/m^3 (from memory)",
            .mbl_src_k = ENTER " (nylon MBL 0.20 d^2 kN, from memory)",
            .ea_src_k = ENTER " (nylon EA 5 x MBL, from memory; strongly load dependent)",
            .ea_src_m = "approximate: nylon EA 5 x the given MBL (from memory; strongly load "
                        "dependent); enter manufacturer catalogue data",
            .fric_src = "default: fibre rope 0.6 (holdfast choice, as wire; keep fibre off the "
                        "seabed)",
        },
    [HF_COMP_CUSTOM] =
        {
            .label = "custom component",
            .friction = 1.0,
            .fric_src = "default: 1.0 (holdfast choice, as chain; give seabed_friction)",
        },
};

const char *hf_component_type_name(hf_component_type t)
{
    return (unsigned)t < HF_COMP_TYPE_COUNT ? type_names[t] : "unknown";
}

const char *hf_component_grade_name(hf_chain_grade g)
{
    return (unsigned)g < HF_GRADE_COUNT ? grade_names[g] : "unknown";
}

const char *hf_component_prop_name(hf_component_prop p)
{
    return (unsigned)p < HF_PROP_COUNT ? prop_names[p] : "unknown";
}

hf_status hf_component_type_lookup(const char *name, hf_component_type *out)
{
    for (int t = 0; name && t < HF_COMP_TYPE_COUNT; t++) {
        if (strcmp(name, type_names[t]) == 0) {
            *out = (hf_component_type)t;
            return HF_OK;
        }
    }
    return HF_EINVAL;
}

hf_status hf_component_grade_lookup(const char *name, hf_chain_grade *out)
{
    /* "none" is not a name users may write: HF_GRADE_NONE means "no grade". */
    for (int g = HF_GRADE_NONE + 1; name && g < HF_GRADE_COUNT; g++) {
        if (strcmp(name, grade_names[g]) == 0) {
            *out = (hf_chain_grade)g;
            return HF_OK;
        }
    }
    return HF_EINVAL;
}

const char *hf_component_type_list(void)
{
    return "studless_chain, studlink_chain, six_strand, spiral_strand, polyester, nylon, custom";
}

const char *hf_component_grade_list(void)
{
    return "R3, R3S, R4, R4S, R5 (offshore) and 1, 2, 3 (ship anchor chain)";
}

bool hf_component_is_chain(hf_component_type t)
{
    return t == HF_COMP_STUDLESS_CHAIN || t == HF_COMP_STUDLINK_CHAIN;
}

void hf_component_init(hf_component *c, hf_component_type t)
{
    memset(c, 0, sizeof *c);
    c->type = t;
    c->grade = HF_GRADE_NONE;
    for (int p = 0; p < HF_PROP_COUNT; p++)
        c->source[p] = "not given";
}

void hf_component_give(hf_component *c, hf_component_prop p, double v)
{
    if ((unsigned)p >= HF_PROP_COUNT)
        return;
    c->value[p] = v;
    c->given |= 1u << p;
    c->source[p] = "given";
}

static bool has(const hf_component *c, hf_component_prop p)
{
    return (c->given >> p) & 1u;
}

/* Checks a user-given value: finite and > 0 (friction >= 0). */
static hf_status check_given(const hf_component *c, hf_component_prop p, hf_error *err)
{
    double v = c->value[p];
    bool ok = isfinite(v) && (p == HF_PROP_FRICTION ? v >= 0.0 : v > 0.0);
    if (ok)
        return HF_OK;
    if (!isfinite(v))
        return hf_error_set(err, HF_EINVAL, "%s must be a finite number, got %g", prop_names[p], v);
    return hf_error_set(err, HF_EINVAL, "%s must be %s, got %g%s%s", prop_names[p],
                        p == HF_PROP_FRICTION ? "zero or positive" : "positive", v,
                        prop_units[p][0] ? " " : "", prop_units[p]);
}

/* The user's or derived value is usable: finite and > 0. */
static hf_status check_derived(const hf_component *c, hf_component_prop p, hf_error *err)
{
    double v = c->value[p];
    if (isfinite(v) && v > 0.0)
        return HF_OK;
    return hf_error_set(err, HF_EINVAL,
                        "the derived %s of this %s is not a positive number (%g %s); give %s",
                        prop_names[p], kinds[c->type].label, v, prop_units[p], prop_names[p]);
}

static hf_status resolve_custom(hf_component *c, hf_error *err)
{
    static const hf_component_prop need[] = {HF_PROP_WET_WEIGHT, HF_PROP_EA, HF_PROP_MBL};
    char missing[128] = "";
    for (size_t i = 0; i < sizeof need / sizeof need[0]; i++) {
        if (!has(c, need[i])) {
            if (missing[0])
                strcat(missing, ", ");
            strcat(missing, prop_names[need[i]]);
        }
    }
    if (missing[0])
        return hf_error_set(err, HF_EINVAL,
                            "a custom component needs wet_weight, axial_stiffness and "
                            "breaking_load; missing: %s",
                            missing);
    if (c->diameter != 0.0 && !(isfinite(c->diameter) && c->diameter > 0.0))
        return hf_error_set(err, HF_EINVAL, "diameter must be a positive length, got %g m",
                            c->diameter);
    if (!has(c, HF_PROP_MASS)) {
        c->value[HF_PROP_MASS] = 0.0; /* informational only: never used by the solver */
        c->source[HF_PROP_MASS] = "not given (informational only)";
    }
    return HF_OK;
}

/* Type, water density and grade: grade required for chain, refused elsewhere. */
static hf_status check_kind(const hf_component *c, double rho, hf_error *err)
{
    if ((unsigned)c->type >= HF_COMP_TYPE_COUNT)
        return hf_error_set(err, HF_EINVAL, "unknown component type %d", (int)c->type);
    const kind *k = &kinds[c->type];
    bool chain = hf_component_is_chain(c->type);
    if (!(isfinite(rho) && rho > 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "water density must be a positive number, got %g "
                            "kg/m^3",
                            rho);
    if ((unsigned)c->grade >= HF_GRADE_COUNT)
        return hf_error_set(err, HF_EINVAL, "unknown chain grade %d", (int)c->grade);
    if (chain && c->grade == HF_GRADE_NONE)
        return hf_error_set(err, HF_EINVAL, "a %s needs a grade: %s", k->label,
                            hf_component_grade_list());
    if (!chain && c->grade != HF_GRADE_NONE)
        return hf_error_set(err, HF_EINVAL, "grade %s applies to chain only, not to a %s",
                            grade_names[c->grade], k->label);
    return HF_OK;
}

/* The diameter, needed unless every derived property is given. */
static hf_status check_diameter(const hf_component *c, const kind *k, hf_error *err)
{
    bool chain = hf_component_is_chain(c->type);
    bool need_d = (!has(c, HF_PROP_MASS) && !has(c, HF_PROP_WET_WEIGHT)) || !has(c, HF_PROP_MBL) ||
                  (!has(c, HF_PROP_EA) &&
                   (chain || c->type == HF_COMP_SIX_STRAND || c->type == HF_COMP_SPIRAL_STRAND));
    if (c->diameter == 0.0 && !need_d)
        return HF_OK;
    if (c->diameter == 0.0)
        return hf_error_set(err, HF_EINVAL,
                            "a %s needs a diameter (or else mass or wet_weight, "
                            "axial_stiffness and breaking_load)",
                            k->label);
    if (!isfinite(c->diameter) || c->diameter < k->dmin || c->diameter > k->dmax)
        return hf_error_set(err, HF_EINVAL, "diameter %g mm is outside %g mm to %g mm for a %s",
                            c->diameter * 1e3, k->dmin * 1e3, k->dmax * 1e3, k->label);
    return HF_OK;
}

/* Mass and wet weight: each from the other when only one is given, both
 * from the diameter when neither is.  buoy: submerged fraction of the
 * weight in air.  Sets *approx when a catalogue estimate was used. */
static hf_status resolve_weight(hf_component *c, const kind *k, double rho, double buoy,
                                bool *approx, hf_error *err)
{
    double dmm = c->diameter * 1e3;
    hf_status st;
    if (!has(c, HF_PROP_MASS) && !has(c, HF_PROP_WET_WEIGHT)) {
        c->value[HF_PROP_MASS] = k->mass_k * dmm * dmm;
        c->source[HF_PROP_MASS] = k->mass_src;
        c->value[HF_PROP_WET_WEIGHT] = c->value[HF_PROP_MASS] * G_N * buoy;
        c->source[HF_PROP_WET_WEIGHT] = k->wet_src;
        *approx = *approx || k->approx;
    } else if (!has(c, HF_PROP_MASS)) {
        c->value[HF_PROP_MASS] = c->value[HF_PROP_WET_WEIGHT] / (G_N * buoy);
        c->source[HF_PROP_MASS] = k->mass_w_src;
    } else if (!has(c, HF_PROP_WET_WEIGHT)) {
        c->value[HF_PROP_WET_WEIGHT] = c->value[HF_PROP_MASS] * G_N * buoy;
        c->source[HF_PROP_WET_WEIGHT] = k->wet_m_src;
        *approx = *approx || k->approx;
    }
    if ((st = check_derived(c, HF_PROP_MASS, err)) != HF_OK ||
        (st = check_derived(c, HF_PROP_WET_WEIGHT, err)) != HF_OK) {
        if (buoy <= 0.0)
            return hf_error_set(err, HF_EINVAL,
                                "a %s (material density %g kg/m^3) does not sink in water of "
                                "density %g kg/m^3; give both mass and wet_weight",
                                k->label, k->rho, rho);
        return st;
    }
    return HF_OK;
}

/* MBL from the diameter when not given. */
static void resolve_mbl(hf_component *c, const kind *k, bool *approx)
{
    double dmm = c->diameter * 1e3;
    if (has(c, HF_PROP_MBL))
        return;
    if (hf_component_is_chain(c->type)) {
        /* DNV-OS-E302 / IACS UR W22 (offshore), IACS UR W18 (ship):
         * MBL = c d^2 (44 - 0.08 d) kN, d in mm. */
        c->value[HF_PROP_MBL] = mbl_c[c->grade] * dmm * dmm * (44.0 - 0.08 * dmm) * 1e3;
        c->source[HF_PROP_MBL] = mbl_src[c->grade];
    } else {
        c->value[HF_PROP_MBL] = k->mbl_k * dmm * dmm * 1e3;
        c->source[HF_PROP_MBL] = k->mbl_src_k;
        *approx = true;
    }
}

/* Axial stiffness EA from the diameter (or the MBL for fibre) when not given. */
static void resolve_ea(hf_component *c, const kind *k, bool *approx)
{
    double dm = c->diameter, dmm = dm * 1e3;
    if (has(c, HF_PROP_EA))
        return;
    switch (c->type) {
    case HF_COMP_STUDLESS_CHAIN:
        /* DNV-OS-E301: EA = E A, E = (a - b d) 1e10 Pa (d in mm),
         * A = 2 pi d^2 / 4 (d in m), the two bars of a link. */
        c->value[HF_PROP_EA] =
            (ea_a[c->grade] - ea_b[c->grade] * dmm) * 1e10 * 2.0 * M_PI * dm * dm / 4.0;
        c->source[HF_PROP_EA] = ea_src[c->grade];
        *approx =
            *approx || c->grade == HF_GRADE_1 || c->grade == HF_GRADE_2 || c->grade == HF_GRADE_3;
        break;
    case HF_COMP_STUDLINK_CHAIN:
        c->value[HF_PROP_EA] = 1.01e11 * dm * dm; /* from memory, approximate */
        c->source[HF_PROP_EA] = k->ea_src_k;
        *approx = true;
        break;
    case HF_COMP_SIX_STRAND:
    case HF_COMP_SPIRAL_STRAND:
        c->value[HF_PROP_EA] = k->ea_k * dmm * dmm * 1e3;
        c->source[HF_PROP_EA] = k->ea_src_k;
        *approx = true;
        break;
    default: /* fibre: a multiple of MBL */
        c->value[HF_PROP_EA] = k->ea_k * c->value[HF_PROP_MBL];
        c->source[HF_PROP_EA] = has(c, HF_PROP_MBL) ? k->ea_src_m : k->ea_src_k;
        *approx = true;
        break;
    }
}

/* Default tension-strain curves, strain = a1 t + a2 t^2 + a3 t^3, t = T/MBL:
 * stiffening with load, quasi-static, for a rope past its first loadings.
 * Both are approximate and from memory, shaped to the common-practice ranges:
 * polyester EA about 12-30 x MBL, load dependent (open textbook practice),
 * here a tangent EA of 12.5 x MBL at slack rising to 25 x MBL at t = 2/3
 * (20 x MBL at the MBL), 5 % strain at MBL; nylon far softer, tangent EA
 * 3.3 to 7.9 x MBL, 17 % strain at MBL.
 * Manufacturers' data govern: enter them for any design. */
static const struct {
    hf_component_type type;
    double a[3];
    const char *source;
} strain_defaults[] = {
    {HF_COMP_POLYESTER,
     {0.080, -0.060, 0.030},
     "approximate: enter the manufacturer's data (default polyester curve, from memory: strain "
     "0.080 t - 0.060 t^2 + 0.030 t^3, t = T/MBL)"},
    {HF_COMP_NYLON,
     {0.30, -0.25, 0.12},
     "approximate: enter the manufacturer's data (default nylon curve, from memory: strain "
     "0.30 t - 0.25 t^2 + 0.12 t^3, t = T/MBL)"},
};

hf_status hf_component_strain_default(hf_component_type t, double a[3], const char **source)
{
    for (size_t i = 0; i < sizeof strain_defaults / sizeof strain_defaults[0]; i++)
        if (strain_defaults[i].type == t) {
            memcpy(a, strain_defaults[i].a, 3 * sizeof a[0]);
            if (source)
                *source = strain_defaults[i].source;
            return HF_OK;
        }
    return HF_EINVAL;
}

hf_status hf_component_strain_check(const double a[3], hf_error *err)
{
    if (!isfinite(a[0]) || !isfinite(a[1]) || !isfinite(a[2]))
        return hf_error_set(err, HF_EINVAL, "strain: expected finite coefficients");
    /* the slope a1 + 2 a2 t + 3 a3 t^2 is a parabola: its minimum over [0, 1]
     * is at an end or at its vertex t = -a2 / (3 a3) */
    double lo = fmin(a[0], a[0] + 2 * a[1] + 3 * a[2]);
    if (a[2] > 0) {
        double tv = -a[1] / (3 * a[2]);
        if (tv > 0 && tv < 1)
            lo = fmin(lo, a[0] + 2 * a[1] * tv + 3 * a[2] * tv * tv);
    }
    if (!(lo > 0))
        return hf_error_set(err, HF_EINVAL,
                            "strain: expected a curve whose strain grows with tension over 0 <= "
                            "T/MBL <= 1 (slope a1 + 2 a2 t + 3 a3 t^2 > 0), got [%.6g, %.6g, %.6g] "
                            "(smallest slope %.6g)",
                            a[0], a[1], a[2], lo);
    if (!(a[0] + a[1] + a[2] < 1.0))
        return hf_error_set(err, HF_EINVAL,
                            "strain: expected a strain below 1 at the MBL, got %.6g",
                            a[0] + a[1] + a[2]);
    return HF_OK;
}

/* The tension-strain curve of c: the default filled in, the curve checked. */
static hf_status resolve_strain(hf_component *c, hf_error *err)
{
    if (c->strain_kind == HF_STRAIN_LINEAR) {
        c->strain[0] = c->strain[1] = c->strain[2] = 0.0;
        c->strain_source = "linear: strain = T / EA";
        return HF_OK;
    }
    if (c->strain_kind == HF_STRAIN_DEFAULT) {
        if (hf_component_strain_default(c->type, c->strain, &c->strain_source) != HF_OK)
            return hf_error_set(err, HF_EINVAL,
                                "strain: the catalogue has a default curve for polyester and "
                                "nylon only; give [a1, a2, a3] for a %s",
                                hf_component_type_name(c->type));
        c->approximate = true;
    } else {
        c->strain_source = "given: strain = a1 t + a2 t^2 + a3 t^3, t = T/MBL";
    }
    return hf_component_strain_check(c->strain, err);
}

hf_status hf_component_resolve(hf_component *c, double rho, hf_error *err)
{
    bool approx = false;
    hf_status st = check_kind(c, rho, err);
    if (st != HF_OK)
        return st;
    const kind *k = &kinds[c->type];
    for (int p = 0; p < HF_PROP_COUNT; p++)
        if (has(c, (hf_component_prop)p) &&
            (st = check_given(c, (hf_component_prop)p, err)) != HF_OK)
            return st;

    /* Re-resolving (a sweep changed the spec) starts from the given values. */
    for (int p = 0; p < HF_PROP_COUNT; p++)
        if (!has(c, (hf_component_prop)p)) {
            c->value[p] = 0.0;
            c->source[p] = "not given";
        }
    c->approximate = false;

    if (!has(c, HF_PROP_FRICTION)) {
        c->value[HF_PROP_FRICTION] = k->friction;
        c->source[HF_PROP_FRICTION] = k->fric_src;
    }
    if ((st = resolve_strain(c, err)) != HF_OK)
        return st;
    if (c->type == HF_COMP_CUSTOM)
        return resolve_custom(c, err);
    if ((st = check_diameter(c, k, err)) != HF_OK)
        return st;
    double buoy = 1.0 - rho / k->rho; /* submerged fraction of the weight in air */
    if ((st = resolve_weight(c, k, rho, buoy, &approx, err)) != HF_OK)
        return st;
    resolve_mbl(c, k, &approx);
    resolve_ea(c, k, &approx);
    if ((st = check_derived(c, HF_PROP_MBL, err)) != HF_OK ||
        (st = check_derived(c, HF_PROP_EA, err)) != HF_OK)
        return st;
    c->approximate = approx || c->strain_kind == HF_STRAIN_DEFAULT;
    return HF_OK;
}

hf_status hf_component_diameter_range(hf_component_type t, double *lo, double *hi)
{
    if ((unsigned)t >= HF_COMP_TYPE_COUNT)
        return HF_EINVAL;
    *lo = kinds[t].dmin;
    *hi = kinds[t].dmax;
    return HF_OK;
}
