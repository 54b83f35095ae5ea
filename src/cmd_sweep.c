/* cmd_sweep.c - 'holdfast sweep'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_sweep(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast sweep: not implemented yet\n");
    return HF_EXIT_USAGE;
}
