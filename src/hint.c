/* hint.c - "did you mean" suggestions by Levenshtein edit distance. */
#include <stdio.h>
#include <string.h>
#include "holdfast/hint.h"

void hf_hint_init(hf_hint *h)
{
    h->best = NULL;
    h->d = 0;
}

/* Levenshtein (1966) distance by the two-row dynamic programme. */
size_t hf_hint_distance(const char *a, const char *b)
{
    size_t la = strlen(a), lb = strlen(b);
    if (la > 64 || lb > 64)
        return 1000;
    size_t row[65], prev[65];
    for (size_t j = 0; j <= lb; j++)
        prev[j] = j;
    for (size_t i = 1; i <= la; i++) {
        row[0] = i;
        for (size_t j = 1; j <= lb; j++) {
            size_t sub = prev[j - 1] + (a[i - 1] != b[j - 1]);
            size_t del = prev[j] + 1, ins = row[j - 1] + 1;
            row[j] = sub < del ? (sub < ins ? sub : ins) : (del < ins ? del : ins);
        }
        memcpy(prev, row, (lb + 1) * sizeof *row);
    }
    return prev[lb];
}

void hf_hint_try(hf_hint *h, const char *word, const char *cand)
{
    size_t d = hf_hint_distance(word, cand);
    size_t lw = strlen(word), len = lw > strlen(cand) ? lw : strlen(cand);
    /* A word that starts a longer candidate ("studless" for "studless_chain")
     * is a likely abbreviation, however many letters are missing. */
    int prefix = lw >= 3 && strlen(cand) > lw && !strncmp(cand, word, lw);
    if (d > 0 && (d <= (len + 2) / 3 || prefix) && (!h->best || d < h->d)) {
        h->best = cand;
        h->d = d;
    }
}

const char *hf_hint_text(const hf_hint *h, char *buf, size_t cap)
{
    if (!h->best) {
        if (cap)
            buf[0] = '\0';
        return cap ? buf : "";
    }
    snprintf(buf, cap, "; did you mean \"%s\"?", h->best);
    return buf;
}
