/* alloc.c - counted allocation with failure injection for tests. */
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"

/* Relaxed atomics would do; a plain counter under OpenMP critical is simpler
 * to reason about and allocation is off every hot path. */
static long counter;
static long fail_at;
static int fail_sticky;

static int should_fail(void)
{
    int f = 0;
#pragma omp critical(hf_alloc)
    {
        counter++;
        if (fail_at > 0 && (counter == fail_at || (fail_sticky && counter > fail_at)))
            f = 1;
    }
    return f;
}

void hf_alloc_fail_at(long n, int sticky)
{
#pragma omp critical(hf_alloc)
    {
        counter = 0;
        fail_at = n;
        fail_sticky = sticky;
    }
}

long hf_alloc_count(void)
{
    long c;
#pragma omp critical(hf_alloc)
    c = counter;
    return c;
}

void *hf_malloc(size_t size)
{
    if (should_fail())
        return NULL;
    return malloc(size ? size : 1);
}

void *hf_calloc(size_t count, size_t size)
{
    if (should_fail())
        return NULL;
    if (count == 0 || size == 0)
        count = size = 1;
    return calloc(count, size);
}

void *hf_realloc(void *ptr, size_t size)
{
    if (should_fail())
        return NULL;
    return realloc(ptr, size ? size : 1);
}

char *hf_strndup(const char *s, size_t n)
{
    size_t len = strnlen(s, n);
    char *p = hf_malloc(len + 1);
    if (p) {
        memcpy(p, s, len);
        p[len] = '\0';
    }
    return p;
}

char *hf_strdup(const char *s)
{
    return hf_strndup(s, strlen(s));
}

void hf_free(void *ptr)
{
    free(ptr);
}
