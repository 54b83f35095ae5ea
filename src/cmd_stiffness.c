/* cmd_stiffness.c - 'holdfast stiffness'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_stiffness(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast stiffness: not implemented yet\n");
    return HF_EXIT_USAGE;
}
