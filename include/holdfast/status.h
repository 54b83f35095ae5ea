/* status.h - the one status type of holdfast, error records, GSL handler.
 *
 * Every fallible function returns an hf_status.  Functions that can explain
 * a failure to a person also fill an hf_error, whose text is complete
 * ("case.yaml:12:7: lines[0].sections[1].length: expected ...") and is
 * printed only by main.  Nothing in the library prints or exits. */
#ifndef HOLDFAST_STATUS_H
#define HOLDFAST_STATUS_H

#include <stddef.h>

typedef enum {
    HF_OK = 0,        /* success */
    HF_CONTINUE,      /* an iterative solver has not converged yet (not an error) */
    HF_EINVAL,        /* invalid input or usage: the caller's data is wrong */
    HF_ENOMEM,        /* an allocation failed */
    HF_EIO,           /* reading or writing a file failed */
    HF_ENOCONV,       /* a solver did not converge within its limits */
    HF_EUNSUPPORTED,  /* a configuration the model cannot represent (e.g. buoy on the seabed) */
    HF_ENOEQUIL,      /* no static equilibrium exists (the spread cannot hold the load) */
    HF_ERANGE,        /* a target cannot be reached within the allowed range */
    HF_ELIMIT,        /* input exceeds a documented size limit */
    HF_STATUS_COUNT
} hf_status;

/* Short, stable text for a status ("ok", "invalid input", ...).  Never NULL. */
const char *hf_status_str(hf_status s);

/* Exit status of the command-line tool for a status:
 * 0 ok, 2 bad input or usage (EINVAL, ELIMIT, EIO), 3 numerical failure
 * (ENOCONV, EUNSUPPORTED, ENOEQUIL, ERANGE), 4 out of memory (ENOMEM: the
 * input may be valid; the machine could not hold the work). */
int hf_status_exit_code(hf_status s);

#define HF_ERROR_TEXT 1024

/* An error record: the status and a complete human-readable message. */
typedef struct {
    hf_status status;
    char text[HF_ERROR_TEXT];
} hf_error;

/* Clears an error record (status HF_OK, empty text).  NULL is allowed. */
void hf_error_clear(hf_error *e);

/* Records status s with a printf-style message and returns s, so callers can
 * write `return hf_error_set(err, HF_EINVAL, "...", ...)`.  err may be NULL. */
hf_status hf_error_set(hf_error *e, hf_status s, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

/* Installs holdfast's GSL error handler, which records the last GSL error in
 * thread-local storage instead of aborting the process.  Idempotent. */
void hf_gsl_handler_install(void);

/* The last GSL error message seen on this thread, or "" if none. */
const char *hf_gsl_last_error(void);

#endif
