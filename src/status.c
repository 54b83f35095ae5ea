/* status.c - status texts, error records and the GSL error handler. */
#include <stdarg.h>
#include <stdio.h>
#include <string.h>
#include <gsl/gsl_errno.h>
#include "holdfast/status.h"

static const char *const names[HF_STATUS_COUNT] = {
    [HF_OK] = "ok",
    [HF_CONTINUE] = "not converged yet",
    [HF_EINVAL] = "invalid input",
    [HF_ENOMEM] = "out of memory",
    [HF_EIO] = "input/output error",
    [HF_ENOCONV] = "no convergence",
    [HF_EUNSUPPORTED] = "unsupported configuration",
    [HF_ENOEQUIL] = "no equilibrium",
    [HF_ERANGE] = "target out of range",
    [HF_ELIMIT] = "limit exceeded",
};

const char *hf_status_str(hf_status s)
{
    if ((unsigned)s >= HF_STATUS_COUNT)
        return "unknown status";
    return names[s];
}

int hf_status_exit_code(hf_status s)
{
    switch (s) {
    case HF_OK:
    case HF_CONTINUE:
        return 0;
    case HF_EINVAL:
    case HF_ELIMIT:
    case HF_EIO:
        return 2;
    case HF_ENOMEM:
        return 4;
    default:
        return 3;
    }
}

void hf_error_clear(hf_error *e)
{
    if (e) {
        e->status = HF_OK;
        e->text[0] = '\0';
    }
}

hf_status hf_error_set(hf_error *e, hf_status s, const char *fmt, ...)
{
    if (e) {
        va_list ap;
        va_start(ap, fmt);
        vsnprintf(e->text, sizeof e->text, fmt, ap);
        va_end(ap);
        e->status = s;
    }
    return s;
}

static _Thread_local char gsl_last[256];

static void handler(const char *reason, const char *file, int line, int gsl_errno)
{
    snprintf(gsl_last, sizeof gsl_last, "GSL error %d (%s) at %s:%d: %s", gsl_errno,
             gsl_strerror(gsl_errno), file, line, reason);
}

void hf_gsl_handler_install(void)
{
    gsl_set_error_handler(handler);
}

const char *hf_gsl_last_error(void)
{
    return gsl_last;
}
