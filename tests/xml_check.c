/* xml_check.c - test support: strict XML 1.0 well-formedness checker. */
#include <stdio.h>
#include <string.h>
#include "xml_check.h"

/* ---- a small strict XML well-formedness checker (XML 1.0, W3C 2008) ----
 * Checks: one root element; tags balanced and properly nested; names
 * well-formed; attributes quoted, not repeated, no '<' in values; '&' only
 * in the five predefined entities or character references; no raw '<' in
 * text; no control characters XML forbids; comments, an XML declaration and
 * an HTML5 <!DOCTYPE html> accepted.  Returns NULL, or a message with the
 * byte offset of the first fault. */
static char xml_msg[256];

static int name_start(int c)
{
    return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || c == '_' || c == ':';
}

static int name_char(int c)
{
    return name_start(c) || (c >= '0' && c <= '9') || c == '-' || c == '.';
}

static const char *xml_fail(const char *base, const char *p, const char *what)
{
    snprintf(xml_msg, sizeof xml_msg, "offset %ld: %s near \"%.40s\"", (long)(p - base), what, p);
    return xml_msg;
}

/* Checks text or an attribute value from p to end (exclusive). */
static const char *xml_chars(const char *base, const char *p, const char *end, int in_attr)
{
    for (; p < end; p++) {
        unsigned char c = (unsigned char)*p;
        if (c < 0x20 && c != '\t' && c != '\n' && c != '\r')
            return xml_fail(base, p, "control character");
        if (c == '<')
            return xml_fail(base, p, in_attr ? "'<' in attribute" : "raw '<' in text");
        if (c == '&') {
            const char *q = p + 1;
            if (*q == '#') {
                q++;
                int hex = *q == 'x';
                if (hex)
                    q++;
                const char *d = q;
                while (q < end && (hex ? (strchr("0123456789abcdefABCDEF", *q) != NULL)
                                       : (*q >= '0' && *q <= '9')))
                    q++;
                if (q == d || q >= end || *q != ';')
                    return xml_fail(base, p, "bad character reference");
            } else {
                static const char *const ent[] = {"amp;", "lt;", "gt;", "quot;", "apos;"};
                int ok = 0;
                for (int i = 0; i < 5; i++)
                    if (!strncmp(q, ent[i], strlen(ent[i]))) {
                        ok = 1;
                        q += strlen(ent[i]) - 1;
                    }
                if (!ok)
                    return xml_fail(base, p, "'&' not starting an entity");
            }
            p = q;
        }
    }
    return NULL;
}

const char *hf_test_xml_check(const char *doc)
{
    const char *p = doc;
    const char *stack[256];
    size_t stack_len[256];
    int depth = 0, roots = 0;
    if (!strncmp(p, "<?xml", 5)) {
        const char *e = strstr(p, "?>");
        if (!e)
            return xml_fail(doc, p, "unterminated declaration");
        p = e + 2;
    }
    while (*p) {
        if (*p != '<') {
            const char *e = strchr(p, '<');
            if (!e)
                e = p + strlen(p);
            if (depth == 0)
                for (const char *q = p; q < e; q++)
                    if (!strchr(" \t\r\n", *q))
                        return xml_fail(doc, q, "text outside the root element");
            const char *m = xml_chars(doc, p, e, 0);
            if (m)
                return m;
            p = e;
            continue;
        }
        if (!strncmp(p, "<!--", 4)) {
            const char *e = strstr(p + 4, "-->");
            if (!e)
                return xml_fail(doc, p, "unterminated comment");
            p = e + 3;
            continue;
        }
        if (!strncmp(p, "<!DOCTYPE html>", 15) && depth == 0 && roots == 0) {
            p += 15;
            continue;
        }
        if (p[1] == '/') {
            const char *n = p + 2, *q = n;
            while (name_char((unsigned char)*q))
                q++;
            if (depth == 0)
                return xml_fail(doc, p, "end tag without start tag");
            depth--;
            if ((size_t)(q - n) != stack_len[depth] || strncmp(n, stack[depth], stack_len[depth]))
                return xml_fail(doc, p, "end tag does not match the open element");
            while (*q == ' ' || *q == '\n')
                q++;
            if (*q != '>')
                return xml_fail(doc, q, "malformed end tag");
            p = q + 1;
            continue;
        }
        /* start tag */
        const char *n = p + 1, *q = n;
        if (!name_start((unsigned char)*q))
            return xml_fail(doc, p, "bad element name");
        while (name_char((unsigned char)*q))
            q++;
        const char *ename = n;
        size_t elen = (size_t)(q - n);
        const char *attr_names[64];
        size_t attr_lens[64];
        int nattr = 0;
        for (;;) {
            int ws = 0;
            while (strchr(" \t\r\n", *q) && *q) {
                q++;
                ws = 1;
            }
            if (*q == '>' || (*q == '/' && q[1] == '>'))
                break;
            if (!ws || !name_start((unsigned char)*q))
                return xml_fail(doc, q, "bad attribute");
            const char *an = q;
            while (name_char((unsigned char)*q))
                q++;
            size_t al = (size_t)(q - an);
            for (int i = 0; i < nattr; i++)
                if (attr_lens[i] == al && !strncmp(attr_names[i], an, al))
                    return xml_fail(doc, an, "repeated attribute");
            if (nattr < 64) {
                attr_names[nattr] = an;
                attr_lens[nattr++] = al;
            }
            if (*q != '=' || (q[1] != '"' && q[1] != '\''))
                return xml_fail(doc, q, "attribute without a quoted value");
            char quote = q[1];
            const char *v = q + 2, *ve = strchr(v, quote);
            if (!ve)
                return xml_fail(doc, q, "unterminated attribute value");
            const char *m = xml_chars(doc, v, ve, 1);
            if (m)
                return m;
            q = ve + 1;
        }
        if (depth == 0 && roots++)
            return xml_fail(doc, p, "second root element");
        if (*q == '/') {
            p = q + 2;
            continue;
        }
        if (depth >= 256)
            return xml_fail(doc, p, "nesting too deep");
        stack[depth] = ename;
        stack_len[depth++] = elen;
        p = q + 1;
    }
    if (depth)
        return xml_fail(doc, p, "unclosed element at end");
    if (!roots)
        return xml_fail(doc, p, "no root element");
    return NULL;
}
