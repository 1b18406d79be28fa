#!/usr/bin/env bash
# expect.sh CODE REGEX -- COMMAND...: runs COMMAND, passes when it exits with CODE and its
# combined output matches the extended regular expression REGEX.
set -u
want_code=$1; pattern=$2; shift 2
[ "$1" = "--" ] && shift
out=$("$@" 2>&1); code=$?
printf '%s\n' "$out"
if [ "$code" -ne "$want_code" ]; then
  echo "FAIL: exit code $code, expected $want_code" >&2; exit 1
fi
if ! printf '%s\n' "$out" | grep -E -q -- "$pattern"; then
  echo "FAIL: output does not match: $pattern" >&2; exit 1
fi
echo "ok: exit $code, output matches"
