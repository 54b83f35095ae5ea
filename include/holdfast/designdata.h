/* designdata.h - the case's design-method data: the hull's masses, damping,
 * coefficient tables and reference quantities (hull.mass ... hull.length)
 * and the case's `environments:` list (issue 14).
 *
 * Flow: case file -> case (case_env.c fills it) -> **designdata** (held by
 * the model, hf_model.design) -> design driver (design.h) -> writers.
 * Immutable once loaded: copies of a model share one record through a
 * reference count (atomic, so sweep threads may copy and free models
 * concurrently).  All values SI: kg, kg m^2, m^2, m, rad, s. */
#ifndef HOLDFAST_DESIGNDATA_H
#define HOLDFAST_DESIGNDATA_H

#include <stdatomic.h>
#include <stddef.h>
#include "holdfast/environment.h"
#include "holdfast/status.h"
#include "holdfast/table.h"

/* The four tables, in this order (index into hf_designdata.table). */
enum { HF_DD_RAOS = 0, HF_DD_DRIFT, HF_DD_WIND, HF_DD_CURRENT, HF_DD_NTABLES };

#define HF_DESIGNDATA_MAX_ENV 10000 /* environments in one case (HF_ELIMIT beyond) */

/* One named environment of the case. */
typedef struct {
    char *name;            /* owned; env.name points at it */
    hf_environment env;    /* SI; directions toward, global */
    int src_line, src_col; /* where it starts in the case file (1-based) */
} hf_designdata_env;

typedef struct hf_designdata {
    int has_mass;                   /* 1 when hull.mass was given */
    double mass;                    /* displacement mass, kg */
    double added_mass[2];           /* surge, sway added mass, kg (default 0) */
    double yaw_inertia;             /* kg m^2 (0 = not given) */
    double added_yaw_inertia;       /* kg m^2 (default 0) */
    double damping[3];              /* LF damping, fraction of critical (0 = not given) */
    double wind_area;               /* m^2 (0 = not given) */
    double current_area;            /* m^2 (0 = not given) */
    double length;                  /* m (0 = not given) */
    char *path[HF_DD_NTABLES];      /* resolved table paths (owned), NULL when absent */
    hf_table *table[HF_DD_NTABLES]; /* owned; NULL when absent */
    size_t nenv;
    hf_designdata_env *env; /* owned, nenv entries */
    atomic_int refs;        /* owners (models); internal */
} hf_designdata;

/* Table key names in the case file ("raos", "drift", "wind_coefficients",
 * "current_coefficients") and their kinds; i < HF_DD_NTABLES. */
const char *hf_designdata_table_key(int i);
hf_table_kind hf_designdata_table_kind(int i);

/* A new, empty record owned by the caller (one reference), or NULL
 * (out of memory). */
hf_designdata *hf_designdata_alloc(void);

/* Adds an owner and returns d (NULL allowed: returns NULL). */
hf_designdata *hf_designdata_retain(hf_designdata *d);

/* Drops an owner; frees the record, its tables and environments with the
 * last one.  NULL is allowed. */
void hf_designdata_release(hf_designdata *d);

/* Index of the environment named `name`, or (size_t)-1. */
size_t hf_designdata_env_find(const hf_designdata *d, const char *name);

/* Fills the design method's hull (environment.h) from d: inertias mass +
 * added mass (surge, sway) and yaw_inertia + added_yaw_inertia, damping,
 * borrowed tables, areas, length, the given water density.  d must
 * outlive h. */
void hf_designdata_hull(const hf_designdata *d, double water_density, hf_env_hull *h);

#endif
