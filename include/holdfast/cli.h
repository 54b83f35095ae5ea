/* cli.h - the command-line commands and their shared helpers.
 *
 * Flow: **main** -> one command -> library.  Each command lives in its own
 * file src/cmd_<name>.c and is the only layer (with main) that prints to the
 * terminal.  A command returns the process exit status:
 *   0 success, 1 a criterion failed, 2 bad input, usage or an output that
 *   could not be written, 3 numerical failure, 4 out of memory. */
#ifndef HOLDFAST_CLI_H
#define HOLDFAST_CLI_H

#include <stdio.h>
#include "holdfast/caution.h"
#include "holdfast/status.h"
#include "holdfast/analysis.h"
#include "holdfast/model.h"
#include "holdfast/outfile.h"
#include "holdfast/spread.h"
#include "holdfast/study.h"
#include "holdfast/units.h"

#define HF_EXIT_OK 0
#define HF_EXIT_CRITERION 1
#define HF_EXIT_USAGE 2
#define HF_EXIT_NUMERIC 3
#define HF_EXIT_NOMEM 4

/* Most values of one repeatable option (--load NAME ...). */
#define HF_CLI_MAX_REPEAT 256

/* Commands.  argv[0] is the command name; options follow. */
int hf_cmd_check(int argc, char **argv);
int hf_cmd_lines(int argc, char **argv);
int hf_cmd_curve(int argc, char **argv);
int hf_cmd_stiffness(int argc, char **argv);
int hf_cmd_balance(int argc, char **argv);
int hf_cmd_run(int argc, char **argv);
int hf_cmd_sweep(int argc, char **argv);
int hf_cmd_invert(int argc, char **argv);
int hf_cmd_plot(int argc, char **argv);
int hf_cmd_design(int argc, char **argv); /* cmd_design.c (issue 14) */
/* For `holdfast check`: the hull's design data, its tables and the
 * environments with their coverage (nothing when the case has none). */
void hf_cmd_design_check_print(const hf_model *m);

/* The exit status of a status: hf_status_exit_code, except HF_ENOMEM which
 * has its own, HF_EXIT_NOMEM (4), so that running out of memory is never
 * read as a numerical failure. */
int hf_cli_exit_code(hf_status s);

/* Prints "holdfast: <text>" to stderr (and for HF_ENOMEM a line saying it
 * is out of memory) and returns hf_cli_exit_code(e->status). */
int hf_cli_fail(const hf_error *e);

/* As hf_cli_fail for status s and the message text. */
int hf_cli_fail_status(hf_status s, const char *text);

/* The name of names[0..n-1] (NULL entries skipped) closest to word by edit
 * distance, when it is close enough to be a likely typing error (at most
 * one edit per three letters, at most 3); NULL otherwise.  For "did you
 * mean" hints: "beam-strom" -> "beam-storm". */
const char *hf_cli_suggest(const char *word, const char *const *names, size_t n);

/* hf_cli_suggest over the load case names (loads != 0) or the line names of
 * m: the name (owned by m) or NULL. */
const char *hf_cli_suggest_model(const hf_model *m, int loads, const char *word);

/* Prints "holdfast <cmd>: <printf message>" and a hint to use --help to
 * stderr; returns HF_EXIT_USAGE. */
int hf_cli_usage_error(const char *cmd, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

/* Matches argv[*i] against the option `name` (e.g. "--csv") in either form
 * "--name VALUE" or "--name=VALUE".  Returns 1 when argv[*i] is this option:
 * *value then points into argv (not copied; "" for "--name="), and for the
 * separate form *i has moved to the value's index; when the separate value
 * is missing (name is the last argument) *missing is set to 1 and *value is
 * left unchanged.  Returns 0, changing nothing, otherwise (also for a longer
 * option that merely starts with name, "--csvx").  0 <= *i < argc. */
int hf_cli_option(int argc, char **argv, int *i, const char *name, const char **value,
                  int *missing);

/* As hf_cli_option, for options that must have a value: returns 1 (and
 * sets *value, moving *i as hf_cli_option) only when argv[*i] is the option
 * with its value; 0, changing nothing, otherwise, also when the value is
 * missing (the caller then reports argv[*i] as unknown or incomplete). */
int hf_cli_value(int argc, char **argv, int *i, const char *name, const char **value);

/* When arg is "--help" or "-h": prints `usage` to stdout and returns 1.
 * Otherwise returns 0 and prints nothing. */
int hf_cli_help(const char *arg, const char *usage);

/* One option of a command that reads one CASE file: "--name VALUE" (or
 * "--name=VALUE"), or a flag "--name" without a value. */
typedef struct {
    const char *name;    /* "--csv" */
    const char *missing; /* usage message when the value is missing */
    int nonempty;        /* 1: an empty value ("--name=") gets the same message */
    const char **value;  /* receives the value, the last one given wins; NULL: not kept */
    int *count;          /* incremented each time the option is given; may be NULL */
    const char **list;   /* repeatable: receives every value in order (needs count);
                          * NULL: not kept */
    size_t list_cap;     /* room in list; one more is a usage error ("at most N") */
    int flag;            /* 1: a flag without a value (only count is set) */
} hf_cli_opt;

/* The options every command that writes a CSV or takes a pose shares. */
/* clang-format off */
#define HF_CLI_OPT_CSV(dst) {.name = "--csv", .missing = "--csv needs a FILE (or - for standard output)", .value = (dst)}
#define HF_CLI_OPT_OFFSET(dst) {.name = "--offset", .missing = "--offset needs X,Y,HEADING_DEG", .value = (dst)}
/* A "--name VALUE" option whose last value wins, and a flag. */
#define HF_CLI_OPT_VALUE(nm, msg, dst) {.name = (nm), .missing = (msg), .value = (dst)}
#define HF_CLI_OPT_FLAG(nm, cnt) {.name = (nm), .count = (cnt), .flag = 1}
/* clang-format on */

/* hf_cli_parse_case_args goes on: the arguments were fine. */
#define HF_CLI_CONTINUE (-1)

/* Parses argv[1..argc-1] of command `cmd` (its name in messages) for one
 * CASE file and the options opts[0..nopts-1]: "--help" or "-h" prints
 * `usage` to stdout and returns HF_EXIT_OK; an option without its value, any
 * other argument starting with '-' (but "-" alone), a second CASE file or
 * none at all prints a usage message (hf_cli_usage_error) and returns
 * HF_EXIT_USAGE.  Otherwise sets *case_path (pointing into argv) and returns
 * HF_CLI_CONTINUE.  Arguments are read left to right; the first problem
 * stops the parse. */
int hf_cli_parse_case_args(int argc, char **argv, const char *cmd, const char *usage,
                           const hf_cli_opt *opts, size_t nopts, const char **case_path);

/* As hf_cli_parse_case_args; after `usage`, --help also calls more(stdout)
 * (when not NULL) for text built from the library's tables (the study
 * kinds, the output catalogue). */
int hf_cli_parse_case_args_help(int argc, char **argv, const char *cmd, const char *usage,
                                void (*more)(FILE *out), const hf_cli_opt *opts, size_t nopts,
                                const char **case_path);

/* Initialises m and loads the case at path into it (hf_cli_load).  Returns
 * HF_CLI_CONTINUE, or after printing the message (hf_cli_fail) its exit
 * status, m then empty. */
int hf_cli_case_load(const char *path, hf_model *m);

/* As hf_cli_case_load, and the case's studies into sl (initialised here;
 * hf_study_list_free it; empty after a failure). */
int hf_cli_case_load_studies(const char *path, hf_model *m, hf_study_list *sl);

/* A command on one hull pose (lines, stiffness):
 *   holdfast <cmd> CASE [--offset X,Y,HEADING] [--csv FILE|-] [extra options]
 * The pose is the case's rest pose plus the offset (m, m, degrees). */
typedef struct {
    const char *path;        /* the CASE file (points into argv) */
    const char *csv;         /* --csv value, or NULL */
    const char *offset_text; /* --offset value, or NULL */
    double offset[3];        /* the parsed offset, m, m, rad */
    hf_model m;              /* the loaded case */
    hf_analysis_pose at;     /* the solve at the pose (hf_analysis_pose_solve) */
    hf_error err;            /* an error record for the command, cleared */
} hf_cli_pose_cmd;

#define HF_CLI_POSE_EXTRA_MAX 4

/* Parses the arguments (hf_cli_parse_case_args with --csv, --offset and
 * extra[0..nextra-1], nextra <= HF_CLI_POSE_EXTRA_MAX), checks that no
 * output is the case file, and loads the case.  Returns HF_CLI_CONTINUE
 * (then solve with hf_analysis_pose_solve(&pc->at, &pc->m, pc->offset, ...)
 * and call hf_cli_pose_cmd_end), or after printing the message the exit
 * status (HF_EXIT_OK after --help; hf_cli_pose_cmd_end is then harmless but
 * not needed).  nextra above the limit is a programming error: reported as
 * such, HF_EXIT_USAGE. */
int hf_cli_pose_cmd_begin(hf_cli_pose_cmd *pc, int argc, char **argv, const char *cmd,
                          const char *usage, const hf_cli_opt *extra, size_t nextra);

/* Frees the solve and the model of pc. */
void hf_cli_pose_cmd_end(hf_cli_pose_cmd *pc);

/* Writes a CSV header of model m to out (the hf_results_*_header_write). */
typedef hf_status (*hf_cli_csv_header_fn)(FILE *out, const hf_model *m, hf_error *err);

/* Opens the --csv destination `csv` (a path, or "-" for standard output;
 * include/holdfast/outfile.h) and, when header is not NULL, writes the
 * header with header(stream, m, err).  Returns the open file, or NULL with
 * err set (HF_EIO from the file layer, or the header's status) and nothing
 * left behind. */
hf_outfile *hf_cli_csv_begin(const char *csv, hf_cli_csv_header_fn header, const hf_model *m,
                             hf_error *err);

/* Ends a CSV begun with hf_cli_csv_begin: warns when nonfinite > 0
 * (hf_cli_warn_nonfinite) and commits *f, which is NULL afterwards (a commit
 * frees it either way).  Returns HF_OK, or HF_EIO with err set. */
hf_status hf_cli_csv_end(const char *cmd, hf_outfile **f, size_t nonfinite, hf_error *err);

/* Parses the --jobs value: a whole number 1..1024 into *jobs.  HF_EINVAL with
 * the message "--jobs: expected a whole number 1..1024, got ..." otherwise. */
hf_status hf_cli_parse_jobs(const char *text, int *jobs, hf_error *err);

/* For tables people read: v, or 0 when |v| < half (half a unit of the last
 * printed digit), so that a value that rounds to zero prints as 0, not -0.
 * NaN is returned unchanged. */
double hf_cli_zero_small(double v, double half);

/* Prints "holdfast <cmd>: warning: ..." to stderr when n > 0: n values were
 * not finite and were written as empty CSV fields (the hf_results_* and
 * hf_csv convention).  Prints nothing when n is 0. */
void hf_cli_warn_nonfinite(const char *cmd, size_t n);

/* Loads and resolves a case file into m (initialised by the caller). */
hf_status hf_cli_load(const char *path, hf_model *m, hf_error *err);

/* The one number reader of the command line: parses `text` as a quantity of
 * dimension dim with the case file's rules (include/holdfast/units.h: units
 * allowed, a plain number is SI except angles in degrees; hex, nan, inf and
 * trailing garbage refused) into *out (SI, angles in rad).  HF_EINVAL with
 * "<option>: <why>" otherwise. */
hf_status hf_cli_parse_value(const char *option, const char *text, hf_dim dim, double *out,
                             hf_error *err);

/* Parses "X,Y,HEADING" (lengths, then an angle; plain numbers m, m,
 * degrees; units allowed: "10m,-2 ft,30deg") into offset[0..2] (m, m, rad)
 * with hf_units_parse.  HF_EINVAL with a message naming --offset otherwise. */
hf_status hf_cli_parse_offset(const char *text, double offset[3], hf_error *err);

/* Parses "FROM:TO:STEP" (lengths; plain numbers in m, units allowed) with
 * step != 0 of the right sign and at most `max_points` points, counted by
 * the one range rule of holdfast (hf_study_range_count: TO is included when
 * it lies on the grid up to rounding).  Sets *count.
 * HF_EINVAL (malformed) or HF_ELIMIT (too many points) with a message. */
hf_status hf_cli_parse_range(const char *text, double *from, double *to, double *step,
                             size_t max_points, size_t *count, hf_error *err);

/* Checks an output path given to `option` before anything is computed or
 * printed: an empty name is refused, "-" (standard output) is fine, and a
 * path that is the same file as `input` (hf_outfile_check_not_input: same
 * device and inode, whatever the spelling; input may be NULL) is refused so that an output never
 * replaces the case file.  HF_OK, or HF_EINVAL with a message naming the
 * option. */
hf_status hf_cli_check_output(const char *option, const char *out, const char *input,
                              hf_error *err);

/* mkdir -p: creates directory dir and any missing parents (mode 0777 less
 * the umask); an existing directory is fine.  HF_OK, HF_EINVAL (empty or
 * longer than 4095 bytes) or HF_EIO (cannot create, or exists and is not a
 * directory), the message starting with `what` ("--profiles"). */
hf_status hf_cli_make_dir(const char *what, const char *dir, hf_error *err);

/* The short safety caution printed with results a person may build on: the
 * one text of include/holdfast/caution.h (this name is kept for the
 * commands written before that module). */
#define hf_cli_caution hf_caution_text

/* A progress bar on standard error for long runs (sweep cases, balance
 * conditions), redrawn at most ten times a second.  Start it with
 * hf_cli_bar_start; hf_cli_bar_draw(b, done, total, "cases") draws
 * "[####....]  42.0%  420/1000 cases  120/s  5 s left"; hf_cli_bar_clear
 * wipes the line if anything was drawn.  The caller decides whether a
 * terminal is there to see it. */
typedef struct {
    double start; /* s, monotonic clock */
    double last;  /* s, last drawn */
    int drawn;    /* 1 once a bar was drawn */
} hf_cli_bar;

void hf_cli_bar_start(hf_cli_bar *b);
void hf_cli_bar_draw(hf_cli_bar *b, unsigned long long done, unsigned long long total,
                     const char *what);
void hf_cli_bar_clear(hf_cli_bar *b);

#endif
