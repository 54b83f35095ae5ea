/* designdata.c - the case's design-method data (hull properties, tables,
 * environments): ownership shared by reference count, lookups, and the
 * environment module's hull view.  Formulas: docs/design.md. */
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/designdata.h"

static const char *const table_keys[HF_DD_NTABLES] = {"raos", "drift", "wind_coefficients",
                                                      "current_coefficients"};
static const hf_table_kind table_kinds[HF_DD_NTABLES] = {HF_TABLE_RAO, HF_TABLE_DRIFT,
                                                         HF_TABLE_COEF, HF_TABLE_COEF};

const char *hf_designdata_table_key(int i)
{
    return i >= 0 && i < HF_DD_NTABLES ? table_keys[i] : "?";
}

hf_table_kind hf_designdata_table_kind(int i)
{
    return i >= 0 && i < HF_DD_NTABLES ? table_kinds[i] : HF_TABLE_COEF;
}

hf_designdata *hf_designdata_alloc(void)
{
    hf_designdata *d = hf_calloc(1, sizeof *d);
    if (d)
        atomic_init(&d->refs, 1);
    return d;
}

hf_designdata *hf_designdata_retain(hf_designdata *d)
{
    if (d)
        atomic_fetch_add(&d->refs, 1);
    return d;
}

void hf_designdata_release(hf_designdata *d)
{
    if (!d || atomic_fetch_sub(&d->refs, 1) > 1)
        return;
    for (int i = 0; i < HF_DD_NTABLES; i++) {
        hf_free(d->path[i]);
        hf_table_free(d->table[i]);
    }
    for (size_t i = 0; i < d->nenv; i++)
        hf_free(d->env[i].name);
    hf_free(d->env);
    hf_free(d);
}

size_t hf_designdata_env_find(const hf_designdata *d, const char *name)
{
    for (size_t i = 0; d && name && i < d->nenv; i++)
        if (!strcmp(d->env[i].name, name))
            return i;
    return (size_t)-1;
}

void hf_designdata_hull(const hf_designdata *d, double water_density, hf_env_hull *h)
{
    hf_env_hull_default(h);
    h->inertia[0] = d->mass + d->added_mass[0];
    h->inertia[1] = d->mass + d->added_mass[1];
    h->inertia[2] = d->yaw_inertia + d->added_yaw_inertia;
    for (int i = 0; i < 3; i++)
        h->damping[i] = d->damping[i];
    h->raos = d->table[HF_DD_RAOS];
    h->drift = d->table[HF_DD_DRIFT];
    h->wind = d->table[HF_DD_WIND];
    h->current = d->table[HF_DD_CURRENT];
    h->wind_area = d->wind_area;
    h->current_area = d->current_area;
    h->length = d->length;
    h->water_density = water_density;
}
