/* case_tree.h - private to the case loader (case.c, case_env.c): the small
 * document tree built from libyaml events, the loader context, and the
 * checks case.c exports to the other files of the loader.  Not installed;
 * the public interface is include/holdfast/case.h. */
#ifndef HOLDFAST_CASE_TREE_H
#define HOLDFAST_CASE_TREE_H

#include <stddef.h>
#include "holdfast/model.h"
#include "holdfast/study.h"
#include "holdfast/units.h"

enum { N_SCALAR, N_SEQ, N_MAP };

typedef struct node {
    int type;
    int line, col; /* 1-based position of the node's first character */
    int plain;     /* scalar written without quotes */
    char *text;    /* scalar text (NUL-terminated) */
    size_t n, cap; /* children: sequence items, or key, value, key, value, ... */
    struct node **kids;
} node;

/* ---- loader context: file name, key path, error ---- */

typedef struct {
    const char *file;
    hf_model *m;
    hf_study_list *studies; /* the case's studies: filled beside the model */
    hf_error *err;
    char path[512];
    size_t plen;
} ctx;

/* Value ranges of hf_case_tree_quantity (as case.c's quantity_in). */
enum { HF_CASE_ANY = 0, HF_CASE_POSITIVE, HF_CASE_NONNEG };

/* The checks of case.c, for case_env.c.  Each fails with the message
 * "FILE:LINE:COL: KEY.PATH: expected ..." in c->err and returns its status. */
size_t hf_case_tree_pushkey(ctx *c, const char *key);
size_t hf_case_tree_pushindex(ctx *c, size_t i); /* "[i]" */
void hf_case_tree_pop(ctx *c, size_t mark);
hf_status hf_case_tree_fail(ctx *c, const node *n, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;
hf_status hf_case_tree_nomem(ctx *c);
const char *hf_case_tree_got(const node *n, char *buf, size_t cap);
int hf_case_tree_is_null(const node *n);
hf_status hf_case_tree_map_check(ctx *c, const node *n, const char *what, const char *const *keys);
const node *hf_case_tree_get(const node *map, const char *key);
const node *hf_case_tree_getkey(const node *map, const char *key);
hf_status hf_case_tree_missing(ctx *c, const node *map, const char *key, const char *what);
hf_status hf_case_tree_quantity(ctx *c, const node *n, hf_dim dim, int range, double *out);
hf_status hf_case_tree_opt_quantity(ctx *c, const node *map, const char *key, hf_dim dim, int range,
                                    double *out);
hf_status hf_case_tree_text(ctx *c, const node *n, const char *what, const char **out);
hf_status hf_case_tree_name_dup(ctx *c, const node *n, const char *what, char **out);

/* case_env.c: the design method's hull keys (hull.mass ... hull.length) of
 * the hull mapping n, and the top-level `environments:` list.  They fill
 * c->m->design (allocated on first use). */
hf_status hf_case_env_hull(ctx *c, const node *n);
hf_status hf_case_env_list(ctx *c, const node *n);
/* The body of a `kind: design` study (its optional environments: list of
 * names, each an environment of the case). */
hf_status hf_case_env_study(ctx *c, const node *n, hf_study *s);

#endif
