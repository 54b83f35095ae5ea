/* cmd_lines.c - 'holdfast lines'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_lines(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast lines: not implemented yet\n");
    return HF_EXIT_USAGE;
}
