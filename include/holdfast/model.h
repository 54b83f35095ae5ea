/* model.h - the physical model of a case: site, components, lines, hull,
 * loads, criteria, all in SI units.  The case's studies are not part of it:
 * they are a list of their own (study.h, hf_study_list).
 *
 * Flow: case loader -> **model** -> line solve / spread / balance / studies.
 * The loader fills the "spec" fields; hf_model_resolve() derives component
 * properties and builds each line's hf_line from them.  Sweeps change a spec
 * value through a parameter path and resolve again.  The model owns all its
 * memory; hf_model_free() releases it. */
#ifndef HOLDFAST_MODEL_H
#define HOLDFAST_MODEL_H

#include <stddef.h>
#include "holdfast/status.h"
#include "holdfast/units.h"
#include "holdfast/component.h"
#include "holdfast/line.h"

/* Documented limits (errors name them when hit). */
#define HF_MODEL_MAX_LINES 100000
#define HF_MODEL_MAX_NAME 128
#define HF_MODEL_MAX_LEVELS 512 /* still water levels of an envelope */
#define HF_MODEL_LEVEL_STEP 0.1 /* m: spacing of a [low, high] envelope */

typedef struct {
    double depth;         /* water depth from the datum to the flat seabed, m (> 0) */
    double water_level;   /* still water level above the datum (tide), m; default 0 */
    double water_density; /* kg/m^3; default 1025 */
    /* The envelope of still water levels (tide plus surge) a design check covers
     * (site.water_levels; docs/case-format.md), m above the datum, ascending as given.
     * 0 levels: the case gives none, the checks cover water_level alone.  A case's
     * [low, high] is expanded here: low, low + HF_MODEL_LEVEL_STEP, ... and high
     * itself (water_levels_range 1). */
    size_t nwater_levels;
    int water_levels_range;
    double water_levels[HF_MODEL_MAX_LEVELS];
} hf_site;

typedef struct {
    char *name;
    hf_component comp;     /* spec and resolved properties */
    int src_line, src_col; /* where it was defined in the case file (1-based; 0 unknown) */
} hf_model_component;

typedef enum { HF_PIECE_SECTION = 0, HF_PIECE_CLUMP, HF_PIECE_BUOY } hf_piece_kind;

/* One entry of a line's `sections:` list, anchor first. */
typedef struct {
    hf_piece_kind kind;
    size_t component; /* section: index into hf_model.components */
    double length;    /* section: unstretched length, m */
    double load;      /* clump: net weight in water, buoy: net lift; N, > 0 in both */
    double friction;  /* clump/buoy: seabed friction, -; default 1.0 */
} hf_piece;

typedef enum {
    HF_ANCHOR_DRAG = 0, /* drag-embedment anchor (default) */
    HF_ANCHOR_GRAVITY,  /* gravity (deadweight) block */
    HF_ANCHOR_PILE,
    HF_ANCHOR_PLATE
} hf_anchor_kind;

typedef struct {
    hf_anchor_kind kind;
    double weight;           /* gravity block: submerged weight, N */
    double friction;         /* gravity block on the seabed, -; default 0.5 */
    double max_uplift_angle; /* drag anchor: allowed uplift angle, rad; default 0 */
    /* gravity block: required factors of this line (block_sliding_factor,
     * block_uplift_factor); 0 = the case's (hf_criteria) */
    double required_sliding, required_uplift;
} hf_anchor;

typedef struct {
    char *name;
    double anchor[2];   /* global x, y of the anchor on the seabed, m */
    double fairlead[3]; /* hull-frame x, y, z of the fairlead, m */
    hf_anchor anchor_spec;
    size_t npieces;
    hf_piece *pieces;
    hf_line line; /* built by hf_model_resolve() from pieces and components */
    int src_line, src_col;
} hf_model_line;

typedef struct {
    double position[2]; /* global x, y of the hull reference point, m */
    double heading;     /* rad, counterclockwise from global x, seen from above */
    size_t noutline;
    double (*outline)[2]; /* optional hull-frame polygon for plots, m */
} hf_hull;

/* A drag load 1/2 rho C A V^2 acting toward `direction`. */
typedef struct {
    double density;     /* fluid density, kg/m^3 (air 1.225, water: site) */
    double coefficient; /* drag coefficient C, - */
    double area;        /* projected area A, m^2 */
    double speed;       /* V, m/s */
    double direction;   /* rad, counterclockwise from global x: where the load pushes to */
} hf_drag;

typedef struct {
    char *name;
    double force;     /* magnitude of the direct force, N (>= 0) */
    double direction; /* direction the force acts toward, rad from global x */
    double moment;    /* yaw moment about the reference point, N m (ccw +) */
    size_t ndrag;
    hf_drag *drag; /* wind and current terms */
    int no_force;  /* 1 when the case gives no direct force (force: absent): the
                      load is its drag terms and moment; 0 (the default) otherwise */
} hf_load;

typedef enum { HF_ANALYSIS_QUASI_STATIC = 0, HF_ANALYSIS_DYNAMIC } hf_analysis_kind;

typedef struct {
    char *preset; /* preset name, or NULL for user factors only */
    hf_analysis_kind analysis;
    double factor_intact;  /* required MBL / tension, intact; 0 = no check */
    double factor_damaged; /* one line broken; 0 = no check */
    double max_offset;     /* allowed horizontal offset, m; 0 = no check */
    const char *source;    /* static text: where the factors come from */
    /* anchors (docs/criteria.md section 3): required gravity-block factors of
     * every line that gives none (block_sliding_factor, block_uplift_factor;
     * 0 = HF_CRITERIA_GRAVITY_*, 1.0), and anchor_line_friction: ignore (1)
     * to take anchor loads with the grounded line's seabed friction ignored */
    double block_sliding, block_uplift;
    int anchor_ignore_friction;
} hf_criteria;

typedef struct {
    char *title;
    char *source_path; /* the case file's path, for messages and reports */
    hf_site site;
    size_t ncomponents;
    hf_model_component *components;
    size_t nlines;
    hf_model_line *lines;
    hf_hull hull;
    size_t nloads;
    hf_load *loads;
    hf_criteria criteria;
    /* issue 14: hull design data and environments (designdata.h), NULL when
     * the case has none; shared by copies (reference count), read-only. */
    struct hf_designdata *design;
} hf_model;

/* Empty model (no lines); hf_model_free() works on it. */
void hf_model_init(hf_model *m);

/* Releases everything the model owns and re-initialises it.  NULL is allowed. */
void hf_model_free(hf_model *m);

/* Deep copy of src into dst (dst is overwritten, not freed first).
 * Returns HF_OK or HF_ENOMEM (dst is then left empty). */
hf_status hf_model_copy(hf_model *dst, const hf_model *src);

/* Derives component properties and rebuilds every line's hf_line from its
 * pieces.  Consecutive clumps/buoys at one joint add up.  Returns HF_EINVAL
 * with a message (e.g. a clump at a line end, too many sections) or HF_OK. */
hf_status hf_model_resolve(hf_model *m, hf_error *err);

/* Height of the still water level above the seabed, m: depth + water_level. */
double hf_model_water_height(const hf_model *m);

/* Index of the line / component / load named `name`, or (size_t)-1. */
size_t hf_model_line_find(const hf_model *m, const char *name);
size_t hf_model_component_find(const hf_model *m, const char *name);
size_t hf_model_load_find(const hf_model *m, const char *name);

/* A numeric parameter reached through a path such as "site.depth",
 * "site.water_level", "lines[bow-port].sections[2].length",
 * "lines[0].anchor_radius", "components.chain76.diameter",
 * "loads[storm].force".  Bound to one model: look it up again in a copy.
 *
 * "loads[X].direction" is the direction of the whole load case: the
 * direction of its direct force, or of its first drag term (wind, else
 * current) when it has no direct force.  Setting it turns every part of the
 * load (the direct force and each wind and current term) by the same angle,
 * so their relative directions are kept.  "loads[X].force" needs a load with
 * a direct force (no_force 0): on a load made only of drag terms the lookup
 * is refused rather than adding a force the case file does not have. */
typedef struct {
    double *value; /* where the SI value lives in the model (NULL for derived paths) */
    hf_dim dim;
    int kind;     /* internal: what to re-derive after a change */
    size_t index; /* internal */
    size_t sub;   /* internal: second index (section entry, property, coordinate) */
} hf_param;

/* Finds the parameter at `path` in m.  HF_EINVAL with a message listing what
 * was expected when the path is unknown. */
hf_status hf_model_param_lookup(hf_model *m, const char *path, hf_param *p, hf_error *err);

/* Reads the parameter's SI value into *value.  HF_OK, or HF_EINVAL with a
 * message (and *value untouched) for a parameter that was not looked up or
 * whose value cannot be read (an index outside the model). */
hf_status hf_model_param_get(const hf_model *m, const hf_param *p, double *value, hf_error *err);

/* Sets the parameter's SI value; re-resolves what depends on it and returns
 * HF_EINVAL when the value makes the model invalid (the model is then left
 * as it was). */
hf_status hf_model_param_set(hf_model *m, const hf_param *p, double value, hf_error *err);

/* 1 when setting one parameter changes the value of the other: the same
 * parameter (whatever the spelling: lines[0] / lines[NAME],
 * components.NAME / components[NAME]) or overlapping ones (a line's
 * anchor_radius with its anchor.x or anchor.y).  A sweep or a study must
 * vary each parameter once. */
int hf_model_param_same(const hf_param *a, const hf_param *b);

#endif
