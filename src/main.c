/* main.c - holdfast's entry point: picks the command and maps nothing else.
 * Everything it calls is public API (include/holdfast/). */
#include <errno.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/cli.h"
#include "holdfast/outfile.h"

static const struct {
    const char *name;
    int (*run)(int, char **);
    const char *summary;
} commands[] = {
    {"check", hf_cmd_check, "validate a case and show the resolved components"},
    {"lines", hf_cmd_lines, "solve every line at a hull pose"},
    {"curve", hf_cmd_curve, "restoring force and stiffness against offset"},
    {"stiffness", hf_cmd_stiffness, "6x6 mooring stiffness and static load at a pose"},
    {"balance", hf_cmd_balance, "mean position under load cases, intact and one line broken"},
    {"design", hf_cmd_design, "design offsets and tensions of the environments (issue 14)"},
    {"run", hf_cmd_run, "run every study of a case into a results folder, with a report"},
    {"sweep", hf_cmd_sweep, "vary case parameters over ranges and lists"},
    {"invert", hf_cmd_invert, "find the parameter value that meets a target"},
    {"plot", hf_cmd_plot, "write one SVG figure"},
};
#define NCOMMANDS (sizeof commands / sizeof commands[0])

static void usage(FILE *out)
{
    fprintf(out, "usage: holdfast COMMAND CASE [OPTIONS]\n\n"
                 "Quasi-static analysis of mooring lines and spread moorings.\n\ncommands:\n");
    for (size_t i = 0; i < NCOMMANDS; i++)
        fprintf(out, "  %-10s %s\n", commands[i].name, commands[i].summary);
    fprintf(out, "\n'holdfast COMMAND --help' describes a command; 'man holdfast' all of them\n"
                 "(after make install; in the source tree: man ./docs/holdfast.1).\n"
                 "exit status: 0 ok, 1 a criterion failed, 2 bad input, usage or an output that\n"
                 "could not be written, 3 numerical failure, 4 out of memory\n");
}

/* Every command's output ends here: a write error on standard output (a
 * full disk, /dev/full, a closed pipe) must not pass as success.  Flushes
 * and closes stdout; on failure prints why and returns HF_EXIT_USAGE (2:
 * output could not be written) unless rc already reports a failure. */
static int stdout_closed(int rc)
{
    int bad = fflush(stdout) != 0 || ferror(stdout);
    int e = errno;
    if (fclose(stdout) != 0 && !bad) {
        bad = 1;
        e = errno;
    }
    if (!bad)
        return rc;
    fprintf(stderr, "holdfast: cannot write to standard output: %s\n",
            e ? strerror(e) : "write error");
    return rc == HF_EXIT_OK || rc == HF_EXIT_CRITERION ? HF_EXIT_USAGE : rc;
}

int main(int argc, char **argv)
{
    hf_gsl_handler_install();
    /* SIGXFSZ ignored from the start: at a file size limit (ulimit -f)
     * writes to standard output fail and are reported (exit 2) instead of
     * the signal killing the process (issue 12 item 11). */
    hf_outfile_signals_install();
    if (argc < 2) {
        usage(stderr);
        return HF_EXIT_USAGE;
    }
    if (!strcmp(argv[1], "--help") || !strcmp(argv[1], "-h") || !strcmp(argv[1], "help")) {
        usage(stdout);
        return stdout_closed(HF_EXIT_OK);
    }
    if (!strcmp(argv[1], "--version")) {
        printf("holdfast %s\n", HF_VERSION);
        return stdout_closed(HF_EXIT_OK);
    }
    for (size_t i = 0; i < NCOMMANDS; i++)
        if (!strcmp(argv[1], commands[i].name))
            return stdout_closed(commands[i].run(argc - 1, argv + 1));
    fprintf(stderr, "holdfast: unknown command '%s'; 'holdfast --help' lists the commands\n",
            argv[1]);
    return HF_EXIT_USAGE;
}
