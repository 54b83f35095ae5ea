/* cmd_balance.c - 'holdfast balance'.  PLACEHOLDER: not implemented yet. */
#include <stdio.h>
#include "holdfast/cli.h"

int hf_cmd_balance(int argc, char **argv)
{
    (void)argc;
    (void)argv;
    fprintf(stderr, "holdfast balance: not implemented yet\n");
    return HF_EXIT_USAGE;
}
