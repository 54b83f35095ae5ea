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
