/* caution.h - the safety caution every output a person may build on carries.
 *
 * Flow: studies -> **writers** (csv, svg, report) and the commands.  One text,
 * so the terminal, summary.txt and report.html say the same thing
 * (docs/SAFETY.md explains it). */
#ifndef HOLDFAST_CAUTION_H
#define HOLDFAST_CAUTION_H

/* The caution: three lines, each ending in '\n'.  Quasi-static limits; check
 * against the governing classification rules or local codes; approval by a
 * competent, licensed engineer. */
extern const char hf_caution_text[];

#endif
