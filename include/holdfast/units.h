/* units.h - physical quantities written with units ("76 mm", "1500 kN").
 *
 * Flow: **units** <- case loader.  Converts a text value to SI and checks
 * that its unit has the dimension the caller expects.  Knows nothing of YAML
 * or mooring. */
#ifndef HOLDFAST_UNITS_H
#define HOLDFAST_UNITS_H

#include "holdfast/status.h"

typedef enum {
    HF_DIM_NONE = 0,      /* dimensionless (friction coefficient, factor) */
    HF_DIM_LENGTH,        /* m */
    HF_DIM_FORCE,         /* N */
    HF_DIM_MASS,          /* kg */
    HF_DIM_MASS_PER_LENGTH,  /* kg/m */
    HF_DIM_FORCE_PER_LENGTH, /* N/m */
    HF_DIM_PRESSURE,      /* Pa */
    HF_DIM_ANGLE,         /* rad internally; a plain number means degrees */
    HF_DIM_DENSITY,       /* kg/m^3 */
    HF_DIM_SPEED,         /* m/s */
    HF_DIM_AREA,          /* m^2 */
    HF_DIM_MOMENT,        /* N m */
    HF_DIM_COUNT
} hf_dim;

/* Name of a dimension for messages: "length", "force", ... */
const char *hf_dim_name(hf_dim d);

/* SI unit symbol of a dimension: "m", "N", ..., "rad" for angles, "" for none. */
const char *hf_dim_si(hf_dim d);

/* Parses `text` ("76 mm", "1.5e3 kN", "85", "12 deg") as a quantity of
 * dimension `want` and stores its SI value in *out (angles in radians).  A
 * plain number is SI, except for angles where a plain number is degrees.
 * Angles are reduced by whole turns (hf_units_deg_to_rad for degrees; a
 * value in radians of magnitude 2 pi or more is reduced the same way, to
 * the angle of the same sign in (-2 pi, 2 pi) with the same sine and cosine
 * to within rounding), so any finite angle is accepted and a huge one is
 * never a different direction than its remainder.
 * Rejects: empty text, trailing garbage, non-finite numbers (nan, inf,
 * 1e309), unknown units, and units of another dimension ("3 kN" for a
 * length).  On failure returns HF_EINVAL and a message such as
 * `expected a length, got "3 kN" (a force)` in err. */
hf_status hf_units_parse(const char *text, hf_dim want, double *out, hf_error *err);

/* Degrees to radians with an exact reduction first: r = fmod(deg, 360)
 * (exact in IEEE arithmetic, sign of deg kept, so the result lies in
 * (-2 pi, 2 pi)), then r * (pi / 180).  Every finite value is accepted, and
 * angles that differ by whole turns give the same radians: 280, 1e15 and
 * 1e20 deg all give 280 deg in radians bit for bit.  Values in (-360, 360)
 * are unchanged by the reduction, so they convert exactly as deg * (pi/180)
 * always did.  Non-finite input (NaN, +-inf) gives NaN: validate first (the
 * unit parser refuses non-finite numbers before converting). */
double hf_units_deg_to_rad(double deg);

/* The accepted unit spellings of dimension d as a comma-separated list for
 * messages and help ("mm, cm, m, km, in, ft, nmi"); "" for HF_DIM_NONE and
 * unknown d.  Static text, never NULL.  Products may be written with a
 * space, '*' or a middle dot ("kN m", "kN*m"; also "kNm"), powers as "m^3",
 * "m3" or with a superscript digit.  docs/components.md lists them all. */
const char *hf_units_list(hf_dim d);

#endif
