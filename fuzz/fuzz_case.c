/* fuzz_case.c - libFuzzer harness: arbitrary bytes through the case loader. */
/*
 * Everything the loader reaches runs here: libyaml, the units parser, the
 * component catalogue, model resolution and the line check.  Besides the
 * sanitizers' own reports, the harness traps when the loader breaks its
 * contract (include/holdfast/case.h):
 *   - a status other than ok / EINVAL / ELIMIT / EIO / ENOMEM;
 *   - a failure without a message, or an error record whose status differs;
 *   - a failure that leaves anything in the model;
 *   - a success whose lines do not pass hf_line_check (the loader promised
 *     a valid model) or whose site values are not finite and in range.
 * A successful model is also deep-copied and both copies freed, so the copy
 * path sees every shape the loader can produce.
 */
#include <math.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>
#include "holdfast/case.h"
#include "holdfast/line.h"
#include "holdfast/study.h"
#include "holdfast/model.h"
#include "holdfast/status.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);
int LLVMFuzzerInitialize(int *argc, char ***argv);

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    hf_gsl_handler_install();
    return 0;
}

static void check_model(const hf_model *m)
{
    if (!(isfinite(m->site.depth) && m->site.depth > 0.0))
        __builtin_trap();
    if (!isfinite(m->site.water_level) || !(m->site.water_density > 0.0) ||
        !isfinite(m->site.water_density))
        __builtin_trap();
    for (size_t i = 0; i < m->nlines; i++) {
        if (hf_line_check(&m->lines[i].line, NULL) != HF_OK)
            __builtin_trap();
        if (!m->lines[i].name)
            __builtin_trap();
    }
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    hf_model m;
    hf_study_list sl;
    hf_error err;
    hf_model_init(&m);
    hf_study_list_init(&sl);
    hf_error_clear(&err);
    hf_status st =
        hf_case_load_buffer_with_studies((const char *)data, size, "fuzz.yaml", &m, &sl, &err);
    switch (st) {
    case HF_OK: {
        check_model(&m);
        hf_model copy;
        if (hf_model_copy(&copy, &m) == HF_OK) {
            check_model(&copy);
            hf_model_free(&copy);
        }
        break;
    }
    case HF_EINVAL:
    case HF_ELIMIT:
    case HF_EIO:
    case HF_ENOMEM:
        if (err.status != st || err.text[0] == '\0' ||
            memchr(err.text, '\0', sizeof err.text) == NULL)
            __builtin_trap();
        if (m.nlines != 0 || m.lines != NULL || m.ncomponents != 0 || sl.n != 0)
            __builtin_trap();
        break;
    default:
        __builtin_trap();
    }
    hf_model_free(&m);
    hf_study_list_free(&sl);
    return 0;
}
