#include "greybodyd_suite.h"

int greybodyd_suite_start(greybodyd_suite *suite, const char *log_name,
                          const char *const *extra_args)
{
    curl_global_init(CURL_GLOBAL_DEFAULT);
    suite->client = curl_easy_init();
    if (suite->client == NULL) {
        return -1;
    }
    return greybodyd_start(&suite->server, log_name, "http", extra_args) ? 0 : -1;
}

int greybodyd_suite_stop(greybodyd_suite *suite)
{
    int exit_status = -1;
    bool stopped = greybodyd_stop(&suite->server, &exit_status);
    curl_easy_cleanup(suite->client);
    suite->client = NULL;
    curl_global_cleanup();
    return stopped && exit_status == 0 ? 0 : -1;
}
