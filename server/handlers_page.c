/*
 * The built-in page at GET /: Planck curves and an uncertainty budget drawn in
 * the browser from this service's own /v1 answers.  The page's sources are
 * server/page/; tools/embed-page.sh joins them into one document at build time
 * and writes its bytes to page_index.inc (rule in mk/page.mk), so the binary
 * needs no file at run time and the page cannot drift from the binary that
 * serves it.
 */
#include "handlers.h"

static const unsigned char page_bytes[] = {
#include "page_index.inc"
};

void gb_handle_page(const gb_call *call, gb_reply *reply)
{
    (void)call;
    gb_reply_static(reply, 200, "text/html; charset=utf-8", (const char *)page_bytes,
                    sizeof page_bytes);
}
