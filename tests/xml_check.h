/* xml_check.h - a strict XML well-formedness checker shared by the tests
 * that parse SVG figures and the HTML report. */
#ifndef HOLDFAST_TEST_XML_CHECK_H
#define HOLDFAST_TEST_XML_CHECK_H

/* Returns NULL when doc is well-formed, else a message with the byte offset
 * of the first fault (static storage, overwritten by the next call). */
const char *hf_test_xml_check(const char *doc);

#endif
