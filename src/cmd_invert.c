/* cmd_invert.c - 'holdfast invert'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_invert(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast invert: not implemented yet\n");
    return HF_EXIT_USAGE;
}
