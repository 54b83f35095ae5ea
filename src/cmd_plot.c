/* cmd_plot.c - 'holdfast plot'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_plot(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast plot: not implemented yet\n");
    return HF_EXIT_USAGE;
}
