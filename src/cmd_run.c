/* cmd_run.c - 'holdfast run'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_run(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast run: not implemented yet\n");
    return HF_EXIT_USAGE;
}
