/* caution.c - the safety caution text shared by the writers and the commands. */
#include "holdfast/caution.h"

const char hf_caution_text[] =
    "CAUTION: quasi-static results. Line dynamics, snap loads, wear and corrosion are not\n"
    "included. Check against the governing classification rules or local codes; results\n"
    "must be approved by a competent, licensed engineer before anyone relies on them.\n";
