/* cmd_invert.c - 'holdfast invert': the parameter value that meets a target. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/cli.h"
#include "holdfast/invert.h"
#include "holdfast/outfile.h"
#include "holdfast/sweep.h"

static const char usage_head[] =
    "usage: holdfast invert CASE --vary PATH=LO:HI --target OUTPUT[:LINE]=VALUE\n"
    "                       [--csv FILE|-]\n"
    "\n"
    "Finds the value of one parameter inside [LO, HI] for which an output at the\n"
    "rest pose equals VALUE (GSL Brent bracketing; met to 1e-6 relative or better).\n"
    "\n"
    "  --vary PATH=LO:HI   the parameter and its bracket, e.g.\n"
    "                      lines[bow].sections[2].length=300:500 or\n"
    "                      lines[bow].anchor_radius=600m:900m\n"
    "  --target OUTPUT[:LINE]=VALUE\n"
    "                      an output below that is one number (per-line outputs\n"
    "                      with :LINE; offset_<load> aims at the surge offset);\n"
    "                      VALUE in SI or with units: 900kN, 45kN/m\n"
    "  --csv FILE|-        also write the result as CSV (only CSV on stdout with -)\n"
    "\n"
    "Outputs (name, CSV column with its unit, meaning):\n";

static const char usage_tail[] =
    "\n"
    "Exit status: 0 found, 2 bad input, 3 target not reachable in the bracket\n"
    "(the message gives the outputs at both ends) or no convergence.\n";

/* --help after the usage head: the output catalogue and the closing lines. */
static void help_more(FILE *out)
{
    hf_output_write_help(out, "  ");
    fputs(usage_tail, out);
}

int hf_cmd_invert(int argc, char **argv)
{
    const char *case_path = NULL, *vary_text = NULL, *target_text = NULL, *csv = NULL;
    int nvary = 0, ntarget = 0;
    const hf_cli_opt opts[] = {
        {.name = "--vary",
         .missing = "--vary needs PATH=LO:HI",
         .nonempty = 1,
         .value = &vary_text,
         .count = &nvary},
        {.name = "--target",
         .missing = "--target needs OUTPUT[:LINE]=VALUE",
         .nonempty = 1,
         .value = &target_text,
         .count = &ntarget},
        HF_CLI_OPT_CSV(&csv),
    };
    int prc = hf_cli_parse_case_args_help(argc, argv, "invert", usage_head, help_more, opts,
                                          sizeof opts / sizeof opts[0], &case_path);
    if (prc != HF_CLI_CONTINUE)
        return prc;
    if (nvary > 1 || ntarget > 1)
        return hf_cli_usage_error("invert", "--vary and --target are given once each (an "
                                            "inversion varies one parameter for one target)");
    if (!case_path || !vary_text || !target_text)
        return hf_cli_usage_error("invert", "expected CASE --vary PATH=LO:HI --target "
                                            "OUTPUT[:LINE]=VALUE");
    hf_error out_err; /* issue 12 items 10, 17: a bad --csv is refused before any work */
    if (csv && hf_cli_check_output("--csv", csv, case_path, &out_err) != HF_OK)
        return hf_cli_usage_error("invert", "%s", out_err.text);
    const char *eq = strrchr(target_text, '=');
    if (!eq || eq == target_text || !eq[1])
        return hf_cli_usage_error("invert", "--target: expected OUTPUT[:LINE]=VALUE, got \"%s\"",
                                  target_text);
    hf_model m;
    hf_model_init(&m);
    hf_vary v;
    memset(&v, 0, sizeof v);
    hf_error err;
    hf_error_clear(&err);
    hf_outfile *of = NULL;
    char *oname = NULL;
    int rc = HF_EXIT_OK;
    hf_output o;
    double target;
    hf_invert_result res;
    if (hf_cli_load(case_path, &m, &err) != HF_OK ||
        hf_sweep_vary_parse(&m, vary_text, 1, &v, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    oname = hf_strndup(target_text, (size_t)(eq - target_text));
    if (!oname) {
        hf_error_set(&err, HF_ENOMEM, "out of memory");
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (hf_output_parse(&m, oname, &o, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    hf_error sub;
    hf_error_clear(&sub);
    if (hf_units_parse(eq + 1, hf_output_dim(&o), &target, &sub) != HF_OK) {
        hf_error_set(&err, HF_EINVAL, "--target %s: %s", target_text, sub.text);
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (hf_invert_solve(&m, v.path, v.from, v.to, &o, target, &res, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (!csv || strcmp(csv, "-")) {
        printf("%s = %.10g %s meets %s = %s (relative error %.2g, %d iterations)\n", v.path,
               v.dim == HF_DIM_ANGLE ? res.value * 180.0 / M_PI : res.value,
               v.dim == HF_DIM_ANGLE ? "deg" : hf_dim_si(v.dim), oname, eq + 1, res.relative_error,
               res.iterations);
        fputs(hf_cli_caution, stdout);
    }
    if (csv) {
        of = hf_outfile_open(csv, &err);
        if (!of || hf_invert_write_csv(hf_outfile_stream(of), &m, v.path, &o, target, &res, &err) !=
                       HF_OK) {
            rc = hf_cli_fail(&err);
            goto done;
        }
        hf_status st = hf_outfile_commit(of, &err);
        of = NULL;
        if (st != HF_OK)
            rc = hf_cli_fail(&err);
    }
done:
    hf_outfile_abort(of);
    hf_free(oname);
    hf_sweep_vary_clear(&v);
    hf_model_free(&m);
    return rc;
}
