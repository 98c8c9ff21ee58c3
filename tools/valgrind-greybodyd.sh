#!/bin/sh
# Runs greybodyd ($GREYBODYD_UNDER_VALGRIND, default build/greybodyd) under valgrind memcheck with
# the given arguments: any memory error, or any definite or indirect leak at exit, turns the exit
# status into 99, which the integration suite's "exits 0 on SIGTERM" check then reports.
exec valgrind --quiet --error-exitcode=99 --leak-check=full \
    --errors-for-leak-kinds=definite,indirect --show-leak-kinds=definite,indirect \
    --num-callers=30 "${GREYBODYD_UNDER_VALGRIND:-build/greybodyd}" "$@"
