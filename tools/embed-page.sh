#!/bin/sh
# Builds the page that greybodyd serves at GET / into the binary.
#
#   sh tools/embed-page.sh server/page/index.html build/gen/page_index.inc
#
# Reads the HTML file, replaces each line that holds nothing but
#   <link rel="stylesheet" href="NAME.css">   or   <script src="NAME.js"></script>
# with that file's text inside <style> or <script>, so that the served page is
# one self-contained document (no second request, nothing from elsewhere) while
# the sources stay separate files that also work opened straight from the
# folder.  Writes the result as the comma-separated decimal bytes of a C array
# initialiser; server/handlers_page.c includes it.  Only POSIX sh, awk and od:
# nothing beyond what building the server already needs.
set -eu

if [ "$#" -ne 2 ]; then
    echo "usage: $0 PAGE.html OUTPUT.inc" >&2
    exit 2
fi
page="$1"
output="$2"
folder=$(dirname "$page")
joined="$output.html"
mkdir -p "$(dirname "$output")"

awk -v folder="$folder" '
function inline(name, open_tag, close_tag,    path, line, status) {
    path = folder "/" name
    print open_tag
    while ((status = (getline line < path)) > 0) {
        print line
    }
    if (status < 0) {
        printf "embed-page: cannot read %s\n", path > "/dev/stderr"
        exit 1
    }
    close(path)
    print close_tag
}
/^[ \t]*<link rel="stylesheet" href="[a-z0-9-]+\.css">[ \t]*$/ {
    match($0, /href="[a-z0-9-]+\.css"/)
    inline(substr($0, RSTART + 6, RLENGTH - 7), "<style>", "</style>")
    next
}
/^[ \t]*<script src="[a-z0-9-]+\.js"><\/script>[ \t]*$/ {
    match($0, /src="[a-z0-9-]+\.js"/)
    inline(substr($0, RSTART + 5, RLENGTH - 6), "<script>", "</script>")
    next
}
{ print }
' "$page" > "$joined"

od -An -v -tu1 "$joined" | awk '{ for (i = 1; i <= NF; i++) printf "%s,", $i; printf "\n" }' \
    > "$output.tmp"
mv "$output.tmp" "$output"
