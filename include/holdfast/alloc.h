/* alloc.h - the single door through which holdfast allocates memory.
 *
 * Every allocation in the library goes through these functions, so tests can
 * make the n-th allocation fail and check that every failure path returns
 * HF_ENOMEM cleanly, without a crash or a leak. */
#ifndef HOLDFAST_ALLOC_H
#define HOLDFAST_ALLOC_H

#include <stddef.h>

/* malloc/calloc/realloc/strdup that may be made to fail for tests.
 * They return NULL on failure (real or injected).  hf_free(NULL) is a no-op. */
void *hf_malloc(size_t size);
void *hf_calloc(size_t count, size_t size);
void *hf_realloc(void *ptr, size_t size);
char *hf_strdup(const char *s);
char *hf_strndup(const char *s, size_t n);
void hf_free(void *ptr);

/* Failure injection (tests only).  After hf_alloc_fail_at(n) with n >= 1, the
 * n-th allocation from now fails, and so does every later one when `sticky`
 * is non-zero.  hf_alloc_fail_at(0, 0) turns injection off.  Counting is
 * process-wide and thread-safe. */
void hf_alloc_fail_at(long n, int sticky);

/* Number of allocation calls since the last hf_alloc_fail_at(). */
long hf_alloc_count(void);

#endif
