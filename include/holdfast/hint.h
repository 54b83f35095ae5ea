/* hint.h - "did you mean" suggestions for misspelt names.
 *
 * A small utility used by the case loader and the output catalogue: among
 * candidate words, the one closest to a misspelt word by Levenshtein edit
 * distance (Levenshtein 1966), when it is close enough to be a likely typo
 * (at most a third of the longer word's letters differ, or the word is the
 * start of the candidate: an abbreviation). */
#ifndef HOLDFAST_HINT_H
#define HOLDFAST_HINT_H

#include <stddef.h>

typedef struct {
    const char *best; /* the closest candidate so far (borrowed), or NULL */
    size_t d;         /* its distance */
} hf_hint;

/* Empty hint. */
void hf_hint_init(hf_hint *h);

/* Levenshtein distance of a and b; 1000 when either is over 64 bytes. */
size_t hf_hint_distance(const char *a, const char *b);

/* Considers cand as a suggestion for word (an exact match is no hint). */
void hf_hint_try(hf_hint *h, const char *word, const char *cand);

/* `; did you mean "X"?` into buf (cap bytes) when there is a hint, else "".
 * Returns the text. */
const char *hf_hint_text(const hf_hint *h, char *buf, size_t cap);

#endif
