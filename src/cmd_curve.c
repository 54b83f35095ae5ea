/* cmd_curve.c - 'holdfast curve'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_curve(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast curve: not implemented yet\n");
    return HF_EXIT_USAGE;
}
