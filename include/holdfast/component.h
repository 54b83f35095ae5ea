/* component.h - the line component catalogue: chain, wire, fibre, custom.
 *
 * Flow: case loader -> **component** -> model lines.  From a type, a grade
 * and a nominal diameter it derives mass, wet weight, axial stiffness EA,
 * minimum breaking load and default seabed friction, each from a documented
 * formula with its source (docs/components.md).  Any property the user gives
 * overrides the derived one.  Knows nothing of files or lines. */
#ifndef HOLDFAST_COMPONENT_H
#define HOLDFAST_COMPONENT_H

#include <stdbool.h>
#include "holdfast/status.h"

typedef enum {
    HF_COMP_STUDLESS_CHAIN = 0,
    HF_COMP_STUDLINK_CHAIN,
    HF_COMP_SIX_STRAND,    /* six-strand wire rope */
    HF_COMP_SPIRAL_STRAND, /* spiral-strand wire rope */
    HF_COMP_POLYESTER,
    HF_COMP_NYLON,
    HF_COMP_CUSTOM,
    HF_COMP_TYPE_COUNT
} hf_component_type;

typedef enum {
    HF_GRADE_NONE = 0,
    HF_GRADE_R3,
    HF_GRADE_R3S,
    HF_GRADE_R4,
    HF_GRADE_R4S,
    HF_GRADE_R5,
    HF_GRADE_1,
    HF_GRADE_2,
    HF_GRADE_3, /* ship anchor chain grades */
    HF_GRADE_COUNT
} hf_chain_grade;

/* The resolvable properties, as bit positions in hf_component.given. */
typedef enum {
    HF_PROP_MASS = 0,   /* mass per metre in air, kg/m */
    HF_PROP_WET_WEIGHT, /* submerged weight per metre, N/m */
    HF_PROP_EA,         /* axial stiffness, N */
    HF_PROP_MBL,        /* minimum breaking load, N */
    HF_PROP_FRICTION,   /* axial seabed friction coefficient, - */
    HF_PROP_COUNT
} hf_component_prop;

/* Load-dependent stretch of a component (fibre ropes; issue 15): a cubic
 * tension-strain polynomial strain = a1 t + a2 t^2 + a3 t^3 in t = T / MBL,
 * increasing over 0 <= t <= 1 (hf_component_strain_check). */
typedef enum {
    HF_STRAIN_LINEAR = 0, /* strain = T / EA (the default) */
    HF_STRAIN_GIVEN,      /* the user's coefficients (case key strain: [a1, a2, a3]) */
    HF_STRAIN_DEFAULT     /* the catalogue's approximate curve (strain: default; polyester
                           * and nylon only, hf_component_strain_default) */
} hf_strain_kind;

typedef struct {
    hf_component_type type;
    hf_chain_grade grade;              /* chain only; HF_GRADE_NONE otherwise */
    double diameter;                   /* nominal diameter, m (0 when not given) */
    double value[HF_PROP_COUNT];       /* resolved values, SI units as listed above */
    unsigned given;                    /* bit p set: value[p] was given by the user */
    const char *source[HF_PROP_COUNT]; /* static text: where each value came from */
    bool approximate;                  /* true for wire and fibre: enter catalogue data */
    hf_strain_kind strain_kind;        /* HF_STRAIN_LINEAR unless the case gives strain */
    double strain[3];                  /* a1, a2, a3 (-) when strain_kind is not linear;
                                        * filled by hf_component_resolve for the default */
    const char *strain_source;         /* static text: where the curve comes from */
} hf_component;

/* Stable names: "studless_chain", "studlink_chain", "six_strand",
 * "spiral_strand", "polyester", "nylon", "custom"; grades "R3" ... "R5",
 * "1", "2", "3".  Lookups return HF_EINVAL for unknown names. */
const char *hf_component_type_name(hf_component_type t);
const char *hf_component_grade_name(hf_chain_grade g);
const char *hf_component_prop_name(hf_component_prop p); /* "mass", "wet_weight", ... */
hf_status hf_component_type_lookup(const char *name, hf_component_type *out);
hf_status hf_component_grade_lookup(const char *name, hf_chain_grade *out);

/* Initialises c as a component of type t with nothing given. */
void hf_component_init(hf_component *c, hf_component_type t);

/* Marks property p as given by the user with SI value v. */
void hf_component_give(hf_component *c, hf_component_prop p, double v);

/* Derives every property not given, for sea water of density rho (kg/m^3),
 * and records the source of each.  Returns HF_EINVAL (message in err, naming
 * the missing input, e.g. "a studless chain needs a diameter or ...") when a
 * property cannot be derived, or a derived value is not finite and > 0
 * (friction >= 0). */
hf_status hf_component_resolve(hf_component *c, double rho, hf_error *err);

/* Notes on hf_component_resolve (details in docs/components.md):
 * - It may be called again after the spec changed (sweeps): every value not
 *   given is derived afresh.  Given values are checked (finite, > 0;
 *   friction >= 0) and never changed.
 * - Chain types need a grade; other types must have HF_GRADE_NONE.
 * - A diameter outside the type's range (hf_component_diameter_range) is an
 *   error; diameter 0 means "not given" and is an error only when a value
 *   needs it.
 * - When only one of mass and wet weight is given, the other is derived
 *   from it through the material density; custom components derive nothing
 *   (they need wet_weight, axial_stiffness, breaking_load; a missing mass
 *   stays 0, source "not given (informational only)").
 * - `approximate` is set when any value in use comes from an approximate
 *   formula (wire and fibre catalogue values, studlink EA, the stiffness of
 *   ship-grade studless chain); entering those values clears it.
 * - A tension-strain curve (strain_kind not linear) is checked
 *   (hf_component_strain_check); HF_STRAIN_DEFAULT fills strain[] from the
 *   catalogue (HF_EINVAL for a type without one) and sets `approximate`.
 *   EA keeps its value (shown by `check`) but a line solver that takes the
 *   curve uses the curve for the stretch. */

/* The catalogue's default tension-strain curve of type t (a[0..2] = a1, a2,
 * a3; *source a static text marked approximate).  HF_OK for polyester and
 * nylon; HF_EINVAL (a untouched) for every other type. */
hf_status hf_component_strain_default(hf_component_type t, double a[3], const char **source);

/* Checks a tension-strain polynomial: finite coefficients, slope
 * a1 + 2 a2 t + 3 a3 t^2 > 0 over 0 <= t <= 1 (stretch grows with tension),
 * strain at t = 1 below 1.  HF_OK or HF_EINVAL with a message. */
hf_status hf_component_strain_check(const double a[3], hf_error *err);

/* The accepted names as one line for messages and help, e.g.
 * "studless_chain, studlink_chain, ..."; static text, never NULL. */
const char *hf_component_type_list(void);
const char *hf_component_grade_list(void);

/* True for the two chain types (the only ones that take a grade). */
bool hf_component_is_chain(hf_component_type t);

/* Accepted nominal diameter range of type t in m (*lo = *hi = 0 for custom,
 * whose diameter is informational and only has to be > 0).  Returns
 * HF_EINVAL for an unknown type. */
hf_status hf_component_diameter_range(hf_component_type t, double *lo, double *hi);

#endif
