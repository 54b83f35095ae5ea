/* cmd_check.c - 'holdfast check'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_check(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast check: not implemented yet\n");
    return HF_EXIT_USAGE;
}
