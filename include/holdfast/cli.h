/* cli.h - the command-line commands and their shared helpers.
 *
 * Flow: **main** -> one command -> library.  Each command lives in its own
 * file src/cmd_<name>.c and is the only layer (with main) that prints to the
 * terminal.  A command returns the process exit status:
 *   0 success, 1 a criterion failed, 2 bad input or usage, 3 numerical failure. */
#ifndef HOLDFAST_CLI_H
#define HOLDFAST_CLI_H

#include <stdio.h>
#include "holdfast/status.h"
#include "holdfast/model.h"
#include "holdfast/outfile.h"
#include "holdfast/spread.h"

#define HF_EXIT_OK 0
#define HF_EXIT_CRITERION 1
#define HF_EXIT_USAGE 2
#define HF_EXIT_NUMERIC 3

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

/* Prints "holdfast: <text>" to stderr and returns the exit code for e. */
int hf_cli_fail(const hf_error *e);

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

/* One "--name VALUE" option of a command that reads one CASE file. */
typedef struct {
    const char *name;    /* "--csv" */
    const char *missing; /* usage message when the value is missing */
    int nonempty;        /* 1: an empty value ("--name=") gets the same message */
    const char **value;  /* receives the value, the last one given wins; NULL: not kept */
    int *count;          /* incremented each time the option is given; may be NULL */
} hf_cli_opt;

/* The options every command that writes a CSV or takes a pose shares. */
/* clang-format off */
#define HF_CLI_OPT_CSV(dst) {"--csv", "--csv needs a FILE (or - for standard output)", 0, (dst), NULL}
#define HF_CLI_OPT_OFFSET(dst) {"--offset", "--offset needs X,Y,HEADING_DEG", 0, (dst), NULL}
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

/* Initialises m and loads the case at path into it (hf_cli_load).  Returns
 * HF_CLI_CONTINUE, or after printing the message (hf_cli_fail) its exit
 * status, m then empty. */
int hf_cli_case_load(const char *path, hf_model *m);

/* A command on one hull pose (lines, stiffness):
 *   holdfast <cmd> CASE [--offset X,Y,HEADING_DEG] [--csv FILE|-] [extra options]
 * The pose is the case's rest pose plus the offset (m, m, degrees). */
typedef struct {
    const char *path;        /* the CASE file (points into argv) */
    const char *csv;         /* --csv value, or NULL */
    const char *offset_text; /* --offset value, or NULL */
    hf_model m;              /* the loaded case */
    hf_spread *ws;           /* a spread workspace of m */
    hf_pose pose;            /* rest pose plus the offset */
    hf_error err;            /* an error record for the command, cleared */
} hf_cli_pose_cmd;

#define HF_CLI_POSE_EXTRA_MAX 4

/* Parses the arguments (hf_cli_parse_case_args with --csv, --offset and
 * extra[0..nextra-1], nextra <= HF_CLI_POSE_EXTRA_MAX), loads the case,
 * allocates the workspace and sets the pose.  Returns HF_CLI_CONTINUE (then
 * call hf_cli_pose_cmd_end), or after printing the message the exit status
 * (HF_EXIT_OK after --help; hf_cli_pose_cmd_end is then harmless but not
 * needed).  nextra above the limit is a programming error: reported as
 * such, HF_EXIT_USAGE. */
int hf_cli_pose_cmd_begin(hf_cli_pose_cmd *pc, int argc, char **argv, const char *cmd,
                          const char *usage, const hf_cli_opt *extra, size_t nextra);

/* Frees the workspace and the model of pc. */
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

/* Parses "X,Y,HEADING_DEG" into offset[0..2] (m, m, rad).  HF_EINVAL with a
 * message when malformed or not finite. */
hf_status hf_cli_parse_offset(const char *text, double offset[3], hf_error *err);

/* Parses "FROM:TO:STEP" (plain numbers, SI) with step != 0 of the right sign
 * and at most `max_points` points.  Sets *count. */
hf_status hf_cli_parse_range(const char *text, double *from, double *to, double *step,
                             size_t max_points, size_t *count, hf_error *err);

/* The short safety caution printed with results a person may build on. */
extern const char hf_cli_caution[];

#endif
